import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { compile, lex } from '../../../shared/poise/index'
import { exampleFiles } from './helpers'

function rangesInside(text: string, r = compile(text)): boolean {
  return r.diagnostics.every((d) => d.range.from >= 0 && d.range.from <= d.range.to && d.range.to <= text.length && d.range.line >= 1 && d.range.column >= 1)
}

const poiseish = fc.constantFrom('system', 'component', 'reaction', 'sweep', 'total', 'pH', 'H+', 'Cu^2+', '<=>', '+', '2', '1.5', 'mmol/L', 'K', 'logK', '"t"', '#', '\n', ' ', '(s)', '^', '@', 'use', 'from', 'to', 'step', '-', 'é', '⇌', '²⁺')

// The limit only keeps a loaded machine from failing the suite; speed is measured in npm run bench.
describe('compile never throws and keeps ranges inside the document', { timeout: 60_000 }, () => {
  it('on random text', () => {
    fc.assert(fc.property(fc.string({ maxLength: 200 }), (text) => {
      expect(rangesInside(text)).toBe(true)
      expect(() => lex(text)).not.toThrow()
    }), { numRuns: 300 })
  })
  it('on deeply nested brackets', () => {
    const r = compile('system "x"\ncomponent H' + '('.repeat(20000) + 'H total 1 mM\n')
    expect(r.diagnostics.map((d) => d.code)).toEqual(['P010'])
  })
  it('on random Poise-like token soup', () => {
    fc.assert(fc.property(fc.array(poiseish, { maxLength: 60 }), (parts) => {
      expect(rangesInside(parts.join(' '))).toBe(true)
    }), { numRuns: 300 })
  })
  it('on random mutations of the examples', () => {
    const texts = exampleFiles().map((e) => e.text)
    const mutation = fc.record({
      file: fc.nat({ max: texts.length - 1 }),
      at: fc.nat(),
      cut: fc.nat({ max: 12 }),
      insert: fc.oneof(fc.string({ maxLength: 8 }), poiseish),
    })
    fc.assert(fc.property(fc.array(mutation, { minLength: 1, maxLength: 4 }), (ms) => {
      let text = texts[ms[0]!.file]!
      for (const m of ms) {
        const at = m.at % (text.length + 1)
        text = text.slice(0, at) + m.insert + text.slice(at + m.cut)
      }
      const r = compile(text)
      expect(r.model === null).toBe(r.diagnostics.some((d) => d.severity === 'error'))
      expect(rangesInside(text, r)).toBe(true)
    }), { numRuns: 200 })
  })
})
