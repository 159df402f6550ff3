import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'

const base = `system "Sweeps"
component H+ balance
component Na+ total 10 mmol/L
component CO2(g) pressure 1 atm
reaction H2O <=> H+ + OH- pKw 14 dH 55.84 kJ/mol cite "w"
reaction CO2(g) + H2O <=> H2CO3 logKH -1.47 dH -19.98 kJ/mol cite "k"
reaction H2CO3 <=> HCO3- + H+ pKa 6.35 dH 9.2 kJ/mol cite "a"
`
const sweep = (line: string) => compile(base + line + '\n')

describe('sweep values in model units', () => {
  it('spaces a log sweep evenly in decades, end points included', () => {
    const s = sweep('sweep pressure CO2(g) from 1e-4 atm to 1 atm points 5 log').model!.sweep!
    expect(s.values).toEqual([1e-4, 1e-3, 1e-2, 1e-1, 1])
    expect(s).toMatchObject({ variable: 'pressure', component: 'CO2(g)', log: true, line: 8 })
  })
  it('converts kelvin and kPa to degrees Celsius and atm', () => {
    expect(sweep('sweep temperature from 288.15 K to 298.15 K step 5').model!.sweep!.values).toEqual([15, 20, 25])
    // 1 atm = 101.325 kPa (definition).
    expect(sweep('sweep pressure CO2(g) from 101.325 kPa to 202.65 kPa points 2').model!.sweep!.values).toEqual([1, 2])
  })
  it('converts a mass-unit total sweep with the molar mass', () => {
    // Na 22.990 g/mol (IUPAC CIAAW abridged standard atomic weight).
    const v = sweep('sweep total Na+ from 22.99 mg/L to 45.98 mg/L points 3').model!.sweep!.values
    expect(v[0]).toBeCloseTo(1e-3, 9)
    expect(v[2]).toBeCloseTo(2e-3, 9)
  })
  it('takes the unit of from for a step without one', () => {
    expect(sweep('sweep total Na+ from 1 mmol/L to 2 mmol/L step 0.5').model!.sweep!.values).toEqual([1e-3, 1.5e-3, 2e-3])
  })
  it('refuses a sweep that would be too long, a log pH sweep and a unitless total', () => {
    for (const line of ['sweep pH from 0 to 14 step 0.0001', 'sweep pH from 2 to 12 points 11 log', 'sweep total Na+ from 1 to 2 points 3']) {
      const r = sweep(line)
      expect(r.model).toBeNull()
      expect(r.diagnostics.map((d) => d.code)).toEqual(expect.arrayContaining([expect.stringMatching(/^P0[58]0$/)]))
    }
  })
})

describe('modes in the model', () => {
  it('keeps a gas component out of the species, and a gas that is no component in gases', () => {
    const m = compile(base.replace('component CO2(g) pressure 1 atm', 'component H2CO3 total 1 mmol/L').replace(/reaction CO2\(g\) \+ H2O <=> H2CO3 logKH -1.47/, 'reaction CO2(g) + H2O <=> H2CO3 logKH -1.47')).model!
    expect(m.gases.map((g) => g.name)).toEqual(['CO2(g)'])
    // log10 p(CO2) = log a(H2CO3) − logKH: formation logK of the gas from H2CO3 is +1.47.
    expect(m.gases[0]!.logK).toBeCloseTo(1.47, 12)
    const withGas = compile(base).model!
    expect(withGas.components.find((c) => c.name === 'CO2(g)')).toMatchObject({ mode: 'pressure', value: 1, phase: 'g' })
    expect(withGas.species.some((s) => s.name === 'CO2(g)')).toBe(false)
  })
  it('allows a negative proton total (a proton deficit)', () => {
    const r = compile(base.replace('component H+ balance', 'component H+ total -1 mmol/L'))
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
    expect(r.model!.components[0]).toMatchObject({ name: 'H+', mode: 'total', value: -1e-3 })
  })
})
