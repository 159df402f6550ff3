import { afterEach, describe, expect, it, vi } from 'vitest'
import { mount, type VueWrapper } from '@vue/test-utils'
import { nextTick } from 'vue'
import { EditorView, runScopeHandlers } from '@codemirror/view'
import PoiseEditor from '../../../components/editor/PoiseEditor.vue'

const bath = `system "Nickel strike bath"
component Ni^2+ total 20 mmol/L
component H+ pH 4.5
reaction H2O <=> H+ + OH- pKw 14.00
reaction Ni^2+ + H2O <=> NiOH+ + H+ logK -9.9
`

let wrapper: VueWrapper | null = null
afterEach(() => {
  wrapper?.unmount()
  wrapper = null
})

async function mountEditor(source: string) {
  wrapper = mount(PoiseEditor, { props: { modelValue: source }, attachTo: document.body })
  await nextTick()
  await nextTick()
  const view = EditorView.findFromDOM(wrapper.find('.cm-editor').element as HTMLElement)!
  return { wrapper, view }
}

describe('PoiseEditor', () => {
  it('shows the source and reports edits through v-model', async () => {
    const { wrapper, view } = await mountEditor(bath)
    expect(view.state.doc.toString()).toBe(bath)
    view.dispatch({ changes: { from: view.state.doc.length, insert: 'activity davies\n' } })
    expect(wrapper.emitted('update:modelValue')!.at(-1)).toEqual([bath + 'activity davies\n'])
  })

  it('keeps the cursor when the parent echoes the text, and takes new text from the parent', async () => {
    const { wrapper, view } = await mountEditor(bath)
    view.dispatch({ selection: { anchor: 30 } })
    await wrapper.setProps({ modelValue: bath })
    expect(view.state.selection.main.head).toBe(30)
    await wrapper.setProps({ modelValue: '# a note\n' + bath })
    expect(view.state.doc.toString()).toBe('# a note\n' + bath)
    expect(view.state.selection.main.head).toBe(39)
    expect(wrapper.emitted('update:modelValue')).toBeUndefined()
  })

  it('writes a broken reaction’s message under its line and emits the diagnostics', async () => {
    // Ni^2+ + H2O <=> NiOH+ leaves one H+ out: the right side is short of an H and a charge.
    const broken = bath.replace('NiOH+ + H+', 'NiOH+')
    const { wrapper } = await mountEditor(broken)
    await vi.waitFor(() => expect(wrapper.emitted('diagnostics')).toBeDefined(), { timeout: 3000 })
    const diagnostics = wrapper.emitted('diagnostics')!.at(-1)![0] as { severity: string; message: string; range: { line: number } }[]
    const error = diagnostics.find((d) => d.severity === 'error')!
    expect(error.range.line).toBe(5)
    await vi.waitFor(() => expect(wrapper.find('.cm-poise-message-error').exists()).toBe(true), { timeout: 3000 })
    const shown = wrapper.findAll('.cm-poise-message-error span').map((span) => span.text())
    expect(shown).toContain(error.message)
  })

  it('offers a quick fix under the line and applies it', async () => {
    const { wrapper, view } = await mountEditor(bath.replace('component Ni^2+', 'component Ni+2'))
    await vi.waitFor(() => expect(wrapper.find('.cm-poise-fix').exists()).toBe(true), { timeout: 3000 })
    const fix = wrapper.get('.cm-poise-fix')
    expect(fix.text()).toBe('write Ni^2+')
    await fix.trigger('click')
    expect(view.state.doc.toString()).toBe(bath)
    expect(wrapper.emitted('update:modelValue')!.at(-1)).toEqual([bath])
  })

  it('emits run on Ctrl-Enter and save on Ctrl-S without typing into the text', async () => {
    const { wrapper, view } = await mountEditor(bath)
    const press = (key: string) =>
      runScopeHandlers(view, new KeyboardEvent('keydown', { key, ctrlKey: true, bubbles: true }), 'editor')
    expect(press('Enter')).toBe(true)
    expect(press('s')).toBe(true)
    expect(wrapper.emitted('run')).toHaveLength(1)
    expect(wrapper.emitted('save')).toHaveLength(1)
    expect(view.state.doc.toString()).toBe(bath)
  })

  it('refuses edits when read-only', async () => {
    const { wrapper, view } = await mountEditor(bath)
    await wrapper.setProps({ readonly: true })
    expect(view.state.readOnly).toBe(true)
    expect(wrapper.find('.cm-content').attributes('contenteditable')).toBe('false')
  })
})
