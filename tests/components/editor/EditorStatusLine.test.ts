import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import EditorStatusLine from '../../../components/editor/EditorStatusLine.vue'
import type { Diagnostic } from '../../../shared/poise/diagnostics'

function diagnostic(severity: Diagnostic['severity'], line: number, message: string): Diagnostic {
  return { severity, code: 'P000', message, range: { from: line * 10, to: line * 10 + 3, line, column: 1, endLine: line, endColumn: 4 } }
}

describe('EditorStatusLine', () => {
  it('counts errors and warnings', () => {
    const wrapper = mount(EditorStatusLine, {
      props: { diagnostics: [diagnostic('error', 4, 'a'), diagnostic('warning', 2, 'b'), diagnostic('error', 7, 'c')] },
    })
    expect(wrapper.get('[data-testid="status-errors"]').text()).toBe('2 errors')
    expect(wrapper.get('[data-testid="status-warnings"]').text()).toBe('1 warning')
  })

  it('takes the user to the first error on click', async () => {
    const first = diagnostic('error', 4, 'left has 2 more O than right')
    const wrapper = mount(EditorStatusLine, { props: { diagnostics: [diagnostic('warning', 1, 'no cite'), first, diagnostic('error', 9, 'x')] } })
    await wrapper.get('[data-testid="status-errors"]').trigger('click')
    expect(wrapper.emitted('reveal')).toEqual([[first]])
  })

  it('has nothing to go to when the file is clean', async () => {
    const wrapper = mount(EditorStatusLine, { props: { diagnostics: [] } })
    const errors = wrapper.get('[data-testid="status-errors"]')
    expect(errors.text()).toBe('0 errors')
    expect(errors.attributes('disabled')).toBeDefined()
    await errors.trigger('click')
    expect(wrapper.emitted('reveal')).toBeUndefined()
  })

  it('holds back the counts while the libraries are being checked', async () => {
    const wrapper = mount(EditorStatusLine, { props: { diagnostics: [diagnostic('error', 2, 'no library "acids"')], checking: true } })
    expect(wrapper.get('[data-testid="status-checking"]').text()).toBe('checking…')
    expect(wrapper.find('[data-testid="status-errors"]').exists()).toBe(false)
    await wrapper.setProps({ diagnostics: [], checking: false })
    expect(wrapper.find('[data-testid="status-checking"]').exists()).toBe(false)
    expect(wrapper.get('[data-testid="status-errors"]').text()).toBe('0 errors')
  })

  it('shows the run key, and the last run and solver time when given', () => {
    const wrapper = mount(EditorStatusLine, { props: { diagnostics: [], lastRun: '2026-12-01T10:15:30Z', solverMs: 1840 } })
    expect(wrapper.text()).toMatch(/Run: (Ctrl\+Enter|⌘ Enter)/)
    expect(wrapper.get('[data-testid="status-solver-time"]').text()).toBe('solver 1.84 s')
    // 24-hour time as on the rest of the workbench, never AM/PM (the hour depends on the machine's zone).
    expect(wrapper.get('[data-testid="status-last-run"]').text()).toBe('last run 10:15:30 UTC')
  })
})
