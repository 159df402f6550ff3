import { describe, expect, it } from 'vitest'
import {
  formatFixed,
  formatLog10,
  formatPercent,
  formatScientific,
  NOT_A_NUMBER,
  typesetFormula,
} from '../../../shared/results/typeset'

describe('typesetFormula', () => {
  it.each([
    ['Ca^2+', 'Ca²⁺'],
    ['SO4^2-', 'SO₄²⁻'],
    ['Cu(NH3)4^2+', 'Cu(NH₃)₄²⁺'],
    ['H+', 'H⁺'],
    ['OH-', 'OH⁻'],
    ['NH4+', 'NH₄⁺'],
    ['PO4^3-', 'PO₄³⁻'],
    ['Fe(OH)2^+', 'Fe(OH)₂⁺'],
    ['Hg2^2+', 'Hg₂²⁺'],
    ['CaCO3(s)', 'CaCO₃(s)'],
    ['CO2(g)', 'CO₂(g)'],
    ['NH3(aq)', 'NH₃(aq)'],
    ['H2O', 'H₂O'],
  ])('%s reads as %s', (caret, shown) => {
    expect(typesetFormula(caret)).toBe(shown)
  })

  it('keeps the count that opens a hydrate part as a coefficient on the line', () => {
    expect(typesetFormula('CaSO4·2H2O(s)')).toBe('CaSO₄·2H₂O(s)')
    expect(typesetFormula('CaSO4:2H2O(s)')).toBe('CaSO₄·2H₂O(s)')
  })

  it('leaves text that is already typeset unchanged', () => {
    expect(typesetFormula('SO₄²⁻')).toBe('SO₄²⁻')
  })
})

describe('number formatting', () => {
  it('writes concentrations in scientific notation with three significant figures', () => {
    expect(formatScientific(1.2345e-5)).toBe('1.23e-5')
    expect(formatScientific(0.0031)).toBe('3.10e-3')
    expect(formatScientific(12.5)).toBe('1.25e1')
    expect(formatScientific(-4e-8)).toBe('-4.00e-8')
  })

  it('shows zero, NaN and the infinities without a misleading mantissa', () => {
    expect(formatScientific(0)).toBe('0')
    expect(formatScientific(Number.NaN)).toBe(NOT_A_NUMBER)
    expect(formatScientific(Infinity)).toBe('∞')
    expect(formatScientific(-Infinity)).toBe('−∞')
  })

  it('writes log10 values to two decimals and log10 of zero as minus infinity', () => {
    expect(formatLog10(1.2e-9)).toBe('-8.92')
    expect(formatLog10(1)).toBe('0.00')
    expect(formatLog10(0)).toBe('−∞')
    expect(formatLog10(-1)).toBe(NOT_A_NUMBER)
    expect(formatLog10(Number.NaN)).toBe(NOT_A_NUMBER)
  })

  it('never shows a negative zero', () => {
    expect(formatFixed(-0.001)).toBe('0.00')
    expect(formatFixed(-0)).toBe('0.00')
    expect(formatFixed(-0.006)).toBe('-0.01')
  })

  it('writes shares as percentages', () => {
    expect(formatPercent(0.1234)).toBe('12.3 %')
    expect(formatPercent(1)).toBe('100.0 %')
    expect(formatPercent(Number.NaN)).toBe(NOT_A_NUMBER)
  })
})
