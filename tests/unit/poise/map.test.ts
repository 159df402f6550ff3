import { describe, expect, it } from 'vitest'
import { EditorState } from '@codemirror/state'
import { compile } from '../../../shared/poise/index'
import { SIZE_LIMITS } from '../../../shared/poise/limits'
import { poiseSymbolsField, setPoiseSymbols } from '../../../codemirror/analysis'
import { completionsAt } from '../../../codemirror/completion'
import { symbolAt } from '../../../codemirror/hover'

const base = `system "Copper over pH and dose"
component H+ balance
component Cu^2+ total 1 mmol/L
component Na+ total 10 mmol/L
reaction H2O <=> H+ + OH- pKw 14 dH 55.84 kJ/mol cite "from memory"
reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH- pKsp 19.66 cite "from memory"
`
const withLine = (line: string) => compile(base + line + '\n')
const errors = (line: string) => withLine(line).diagnostics.filter((d) => d.severity === 'error').map((d) => ({ code: d.code, message: d.message, column: d.range.column }))

describe('map: two axes, each as a sweep', () => {
  it('compiles the form of the contract: pH by a log total whose first end borrows the unit of the last', () => {
    const r = withLine('map pH from 2 to 12 points 101 by total Cu^2+ from 1e-6 to 1e-1 mol/L points 51 log')
    expect(r.diagnostics).toEqual([])
    const map = r.model!.map!
    expect(map.line).toBe(7)
    expect(map.x).toMatchObject({ variable: 'pH', component: null, log: false })
    expect(map.x.values).toHaveLength(101)
    expect(map.x.values[0]).toBe(2)
    expect(map.x.values[100]).toBe(12)
    expect(map.y).toMatchObject({ variable: 'total', component: 'Cu^2+', log: true })
    expect(map.y.values).toHaveLength(51)
    expect(map.y.values[0]).toBe(1e-6)
    expect(map.y.values[10]).toBe(1e-5)
    expect(map.y.values[50]).toBe(0.1)
    expect(r.model!.sweep).toBeNull()
  })

  it('gives each axis what a sweep line with the same words gives', () => {
    const axis = 'total Na+ from 1 mmol/L to 20 mmol/L step 0.5'
    const swept = withLine(`sweep ${axis}`).model!.sweep!
    const mapped = withLine(`map pH from 6 to 9 step 1 by ${axis}`).model!.map!.y
    expect({ ...mapped, line: 0 }).toEqual({ ...swept, line: 0 })
    const t = withLine('map temperature from 288.15 K to 298.15 K step 5 by pH from 7 to 8 points 2').model!.map!
    expect(t.x.values).toEqual([15, 20, 25])
    expect(t.y.values).toEqual([7, 8])
  })

  it('refuses two axes that set the same thing, naming the axis to change', () => {
    expect(errors('map pH from 2 to 12 points 11 by pH from 3 to 4 points 3')).toEqual([
      { code: 'P094', column: 34, message: 'both axes of the map vary pH: give the second axis (after `by`) another variable than pH' },
    ])
    const both = errors('map total Cu^2+ from 1 to 2 mmol/L points 3 by total Cu^2+ from 1 to 5 mmol/L points 3')
    expect(both.map((e) => e.code)).toEqual(['P094'])
    expect(both[0]!.message).toContain('both axes of the map vary total Cu^2+')
    const temperatures = errors('map temperature from 5 C to 30 C step 5 by temperature from 5 C to 30 C step 5')
    expect(temperatures[0]!.message).toContain('both axes of the map vary the temperature')
  })

  it('refuses more cells than the one limit, saying how many and what to change', () => {
    const side = Math.ceil(Math.sqrt(SIZE_LIMITS.maxMapCells)) + 1
    const out = errors(`map pH from 2 to 12 points ${side} by total Na+ from 1 to 20 mmol/L points ${side}`)
    expect(out.map((e) => e.code)).toEqual(['P094'])
    expect(out[0]!.message).toBe(`this map has ${side} × ${side} = ${side * side} cells; it may have at most ${SIZE_LIMITS.maxMapCells}: use fewer points on an axis`)
    // An axis keeps the sweep's own limit.
    expect(errors(`map pH from 2 to 12 points ${SIZE_LIMITS.maxSweepPoints + 1} by total Na+ from 1 to 20 mmol/L points 2`)[0]!.message)
      .toBe(`points must be a whole number from 2 to ${SIZE_LIMITS.maxSweepPoints}, not ${SIZE_LIMITS.maxSweepPoints + 1}`)
  })

  it('says what is wrong with one axis in the words of a map', () => {
    expect(errors('map pH from 2 to 12 points 11 log by total Na+ from 1 to 20 mmol/L points 3')).toEqual([
      { code: 'P080', column: 5, message: 'a pH map axis cannot be logarithmic: remove `log`' },
    ])
    expect(errors('map pH from 2 to 12 points 11 by total K+ from 1 to 20 mmol/L points 3')[0]!.message)
      .toBe('map axis total needs a component declared with `total`: K+ is not a component')
    expect(errors('map pH from 2 to 12 points 11 by total Na+ from 1 to 20 points 3')[0]!.code).toBe('P050')
  })

  it('is the file\'s one study: not beside a sweep or a titration, and given once', () => {
    const map = 'map pH from 2 to 12 points 11 by total Na+ from 1 to 20 mmol/L points 3'
    expect(errors(`${map}\nsweep pH from 2 to 3 points 3`)[0]!.message).toBe('a file holds one study: a `map` already sweeps two variables, so remove the `sweep` line (or make it an axis of the map)')
    expect(errors(`${map}\nsample volume 25 mL\ntitrant Na+ 0.1 mol/L\ntitrant OH- 0.1 mol/L\ntitrate from 0 to 10 mL step 1`).map((e) => e.message))
      .toContain('a file holds one study, a map or a titration: remove the `map` line or the `titrate` line')
    expect(errors(`${map}\n${map}`)).toEqual([expect.objectContaining({ code: 'P004', message: '`map` is given twice: keep one (one map a file)' })])
  })

  it('reports a map line cut short at the word it misses', () => {
    expect(errors('map pH from 2 to 12 points 11')).toEqual([expect.objectContaining({ code: 'P002', message: "expected 'by' after '11', found the end of the line" })])
  })
})

describe('map in the editor', () => {
  const symbols = compile(base).symbols
  function offered(text: string): string[] | null {
    const pos = text.indexOf('|')
    const state = EditorState.create({ doc: text.replace('|', ''), extensions: [poiseSymbolsField] }).update({ effects: setPoiseSymbols.of(symbols) }).state
    return completionsAt(state, pos, false)?.options.map((o) => o.label) ?? null
  }
  it('completes a map line word by word', () => {
    expect(offered('m|')).toContain('map')
    expect(offered('map |')).toEqual(['pH', 'total', 'temperature', 'pressure'])
    expect(offered('map total |')).toEqual(['H+', 'Cu^2+', 'Na+'])
    expect(offered('map total Cu^2+ from 1 |')).toContain('mmol/L')
    expect(offered('map pH from 2 to 12 points 11 |')).toEqual(['log', 'by'])
    // What the parser accepts after the spacing: a pH step takes no unit.
    expect(offered('map pH from 2 to 12 step 0.5 |')).toEqual(['log', 'by'])
    expect(offered('map pH from 2 to 12 points 11 by |')).toEqual(['pH', 'total', 'temperature', 'pressure'])
    expect(offered('map pH from 2 to 12 points 11 by total Na+ from 1 |')).toContain('mmol/L')
  })
  it('hovers the component an axis names', () => {
    const text = base + 'map pH from 2 to 12 points 11 by total Cu^2+ from 1e-6 to 1e-1 mol/L points 5 log\n'
    const state = EditorState.create({ doc: text, extensions: [poiseSymbolsField] }).update({ effects: setPoiseSymbols.of(compile(text).symbols) }).state
    const found = symbolAt(state, text.indexOf('by total Cu^2+') + 10)!
    expect(found.description.title).toBe('Cu²⁺')
    expect(found.description.kind).toBe('component')
  })
})
