import { describe, expect, it } from 'vitest'
import { compile, vantHoff, GAS_CONSTANT } from '../../../shared/poise/index'

describe("van 't Hoff", () => {
  // Closed form: log10 K(T) = log10 K(T0) − ΔH/(R ln 10)(1/T − 1/T0), T0 = 298.15 K (van 't Hoff, constant ΔH).
  it('moves pKw 14.00 with dH 55.84 kJ/mol to 50 C by the closed form', () => {
    const expected = -14 - (55840 / (GAS_CONSTANT * Math.LN10)) * (1 / 323.15 - 1 / 298.15)
    expect(vantHoff(-14, 55.84, 50)).toBeCloseTo(expected, 12)
    // Textbook order of magnitude: pKw at 50 C is about 13.26 (from memory).
    expect(-vantHoff(-14, 55.84, 50)).toBeCloseTo(13.26, 1)
  })

  it('compiles OH- at the system temperature with the combined dH', () => {
    const r = compile(`system "warm"
temperature 50 C
component H+ balance
component Na+ total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 dH 55.84 kJ/mol cite "x"
`)
    const oh = r.model!.species.find((s) => s.name === 'OH-')!
    expect(oh.logKRef).toBeCloseTo(-14, 12)
    expect(oh.dH).toBeCloseTo(55.84, 12)
    expect(oh.logK).toBeCloseTo(vantHoff(-14, 55.84, 50), 12)
  })

  it('gives 323.15 K the same result as 50 C', () => {
    const k = compile('system "k"\ntemperature 323.15 K\ncomponent H+ balance\ncomponent Na+ total 1 mM\nreaction H2O <=> H+ + OH- pKw 14 dH 55.84 kJ/mol cite "x"\n')
    expect(k.model!.temperatureC).toBeCloseTo(50, 9)
  })
})
