// The side-by-side text diff folds long unchanged runs; the fold must read as
// plain text, since the merge view's default bracket glyph is missing from our fonts.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { nextTick } from 'vue'
import CompareTextDiff from '../../../components/compare/CompareTextDiff.client.vue'

// Demo text: twenty unchanged comment lines around one changed line.
const lines = Array.from({ length: 20 }, (_, i) => `# rinse tank note ${i + 1}`)
const fromText = [...lines, 'total Cu = 1e-3'].join('\n')
const toText = [...lines, 'total Cu = 2e-3'].join('\n')

function injectedCss(): string {
  const sheets = Array.from(document.adoptedStyleSheets ?? [])
  const adopted = sheets.flatMap((sheet) => Array.from(sheet.cssRules).map((rule) => rule.cssText))
  const inline = Array.from(document.querySelectorAll('style')).map((style) => style.textContent ?? '')
  return [...adopted, ...inline].join('\n')
}

describe('CompareTextDiff', () => {
  it('folds unchanged lines into a plain-text "N unchanged lines" without the bracket glyph', async () => {
    const wrapper = mount(CompareTextDiff, { props: { fromText, toText, fromLabel: 'Revision 1', toLabel: 'Revision 2' }, attachTo: document.body })
    await nextTick()
    await nextTick()
    const folds = wrapper.findAll('.cm-collapsedLines')
    expect(folds.length).toBeGreaterThan(0)
    expect(folds[0].text()).toMatch(/^\d+ unchanged lines$/)
    expect(injectedCss()).toMatch(/\.cm-collapsedLines:before[^{]*\{\s*content:\s*none/)
    wrapper.unmount()
  })
})
