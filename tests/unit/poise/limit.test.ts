import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'

const base = `system "Limits"
component H+ pH 9
component Ni^2+ total 30 mg/L
component NH3 total 20 mmol/L
component SO4^2- total 0.6 mmol/L
reaction H2O <=> H+ + OH- pKw 14 cite "w"
reaction NH4+ <=> NH3 + H+ pKa 9.24 cite "a"
reaction HSO4- <=> SO4^2- + H+ pKa 1.99 cite "h"
reaction Ni^2+ + NH3 <=> NiNH3^2+ logbeta 2.72 cite "b"
reaction Ni(OH)2(s) <=> Ni^2+ + 2 OH- pKsp 15.2 cite "s"
`
const SWEEP = 'sweep pH from 7 to 12 step 0.5\n'
const withLimit = (line: string, sweep = SWEEP) => compile(base + sweep + line + '\n')
const problems = (line: string, sweep = SWEEP) => withLimit(line, sweep).diagnostics.map((d) => ({ code: d.code, severity: d.severity, message: d.message, column: d.range.column }))

describe('limit dissolved X N UNIT', () => {
  it('caps an element in a mass unit as the element (Ni 58.693 g/mol, IUPAC Standard atomic weights 2021)', () => {
    const { model, diagnostics } = withLimit('limit dissolved Ni 1 mg/L')
    expect(diagnostics).toEqual([])
    expect(model!.limits).toEqual([{
      quantity: 'dissolved Ni', target: 'Ni', targetKind: 'element', value: 1, unit: 'mg/L',
      molPerLitre: expect.closeTo(1e-3 / 58.693, 15), weights: [0, 1, 0, 0], line: 12,
    }])
  })

  it('caps ammonia as N when the element is written, and as NH3 (14.007 + 3 × 1.008 g/mol) when the component is', () => {
    const asN = withLimit('limit dissolved N 14.007 mg/L').model!.limits![0]!
    expect(asN.molPerLitre).toBeCloseTo(1e-3, 12)
    expect(asN.weights).toEqual([0, 0, 1, 0])
    const asNH3 = withLimit('limit dissolved NH3 17.031 mg/L').model!.limits![0]!
    expect(asNH3).toMatchObject({ quantity: 'dissolved NH3', targetKind: 'component', target: 'NH3' })
    expect(asNH3.molPerLitre).toBeCloseTo(1e-3, 12)
  })

  it('caps a component in molar units, by its caret name', () => {
    const limit = withLimit('limit dissolved Ni^2+ 10 µmol/L').model!.limits![0]!
    expect(limit).toMatchObject({ quantity: 'dissolved Ni', target: 'Ni^2+', targetKind: 'component', unit: 'µmol/L', weights: [0, 1, 0, 0] })
    expect(limit.molPerLitre).toBeCloseTo(1e-5, 15)
  })

  it('refuses an element no component holds, a formula that is not a component, and H or O', () => {
    expect(problems('limit dissolved Cu 1 mg/L')).toEqual([{ code: 'P084', severity: 'error', column: 17, message: 'no component holds Cu: limit an element of the components (Ni, N, S) or a component such as Ni^2+' }])
    expect(problems('limit dissolved Zn^2+ 1 mg/L')[0]).toMatchObject({ code: 'P084', message: expect.stringContaining('Zn^2+ is neither a component nor an element symbol: write a component of this file (H+, Ni^2+, NH3, SO4^2-)') })
    expect(problems('limit dissolved O 1 mg/L')[0]).toMatchObject({ code: 'P084', message: expect.stringContaining('O is in water itself') })
    expect(problems('limit dissolved H+ 1 mg/L')[0]).toMatchObject({ code: 'P084', message: expect.stringContaining('H+ has no dissolved total') })
    expect(withLimit('limit dissolved Cu 1 mg/L').model).toBeNull()
  })

  it('refuses a unit that is not a concentration, a missing unit, and a limit at or below 0', () => {
    expect(problems('limit dissolved Ni 1 atm')[0]).toMatchObject({ code: 'P050', severity: 'error', message: 'atm is not a concentration unit, such as mmol/L or mg/L: a limit caps a dissolved total' })
    expect(problems('limit dissolved Ni 1')[0]).toMatchObject({ code: 'P050', message: 'expected a concentration unit, such as mmol/L or mg/L after 1' })
    expect(problems('limit dissolved Ni 0 mg/L')[0]).toMatchObject({ code: 'P085', message: 'a limit must be above 0, not 0' })
    expect(problems('limit dissolved Ni -2 mg/L')[0]).toMatchObject({ code: 'P085', message: 'a limit must be above 0, not -2' })
  })

  it('warns, and keeps the limit, when there is no sweep to read it along', () => {
    const { model, diagnostics } = withLimit('limit dissolved Ni 1 mg/L', '')
    expect(diagnostics.map((d) => [d.code, d.severity, d.message])).toEqual([
      ['W109', 'warning', 'a limit is read along a sweep or a titration curve: add a `sweep` or `titrate from` line to see where dissolved Ni is at or below 1 mg/L (a single solve does not use it)'],
    ])
    expect(model!.limits).toHaveLength(1)
  })

  it('is a syntax error without `dissolved` or without a quantity', () => {
    expect(problems('limit Ni 1 mg/L')[0]).toMatchObject({ code: 'P002', message: expect.stringContaining("expected 'dissolved'") })
    expect(problems('limit dissolved Ni')[0]).toMatchObject({ code: 'P002' })
  })

  it('leaves a model without limits as it was', () => {
    expect('limits' in compile(base + SWEEP).model!).toBe(false)
  })
})
