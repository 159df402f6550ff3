/**
 * Output units against IUPAC standard atomic weights (IUPAC/CIAAW, Standard
 * atomic weights 2021, abridged values — the table shared/poise/elements.ts
 * cites). The expected molar masses are written out here by hand from those
 * weights, not computed by the code under test.
 */
import { describe, expect, it } from 'vitest'
import {
  CACO3_GRAMS,
  hardness,
  elementBasis,
  formulaBasis,
  fromMolar,
  parseOutputUnit,
  parseUnitPrefs,
  reportingElement,
  serializeUnitPrefs,
  toMolar,
  unitScale,
} from '../../../shared/results/units'
import { compile } from '../../../shared/poise/index'

describe('molar units', () => {
  it('scale by powers of ten', () => {
    expect(fromMolar(2.5e-3, 'mmol/L', null)).toBeCloseTo(2.5, 12)
    expect(fromMolar(2.5e-6, 'µmol/L', null)).toBeCloseTo(2.5, 12)
    expect(fromMolar(2.5e-3, 'mol/L', null)).toBe(2.5e-3)
  })

  it('read the spellings the language reads', () => {
    expect(parseOutputUnit('umol/L')).toBe('µmol/L')
    expect(parseOutputUnit('ug/L')).toBe('µg/L')
    expect(parseOutputUnit('mM')).toBe('mmol/L')
    expect(parseOutputUnit('atm')).toBeNull()
    expect(parseOutputUnit('g/L')).toBeNull()
  })
})

describe('mass units with IUPAC atomic weights', () => {
  it('convert nickel: 1 mmol/L Ni²⁺ is 58.693 mg/L (Ni 58.693)', () => {
    expect(fromMolar(1e-3, 'mg/L', formulaBasis({ Ni: 1 }))).toBeCloseTo(58.693, 9)
    expect(fromMolar(1e-6, 'µg/L', formulaBasis({ Ni: 1 }))).toBeCloseTo(58.693, 9)
  })

  it('convert sulfate as the ion (S 32.06 + 4 × O 15.999 = 96.056) and as S (32.06)', () => {
    const sulfate = { S: 1, O: 4 }
    expect(fromMolar(1e-3, 'mg/L', formulaBasis(sulfate))).toBeCloseTo(96.056, 9)
    expect(reportingElement(sulfate)).toBe('S')
    expect(fromMolar(1e-3, 'mg/L', elementBasis(sulfate))).toBeCloseTo(32.06, 9)
  })

  it('convert ammonia as N (N 14.007) and phosphate as P (P 30.974)', () => {
    expect(fromMolar(1e-3, 'mg/L', formulaBasis({ N: 1, H: 3 }))).toBeCloseTo(17.031, 9) // 14.007 + 3 × 1.008
    expect(fromMolar(1e-3, 'mg/L', elementBasis({ N: 1, H: 3 }))).toBeCloseTo(14.007, 9)
    expect(fromMolar(1e-3, 'mg/L', elementBasis({ P: 1, O: 4 }))).toBeCloseTo(30.974, 9)
    expect(fromMolar(1e-3, 'mg/L', formulaBasis({ P: 1, O: 4 }))).toBeCloseTo(94.97, 9) // 30.974 + 4 × 15.999
  })

  it('count every atom of the element (dichromate as Cr: 2 × 51.996)', () => {
    expect(fromMolar(1e-3, 'mg/L', elementBasis({ Cr: 2, O: 7 }))).toBeCloseTo(103.992, 9)
  })

  it('has no element basis for a formula of several such elements, and no mass for an element without a standard weight', () => {
    expect(reportingElement({ Cu: 1, N: 4, H: 12 })).toBeNull()
    expect(reportingElement({ H: 1 })).toBeNull()
    expect(fromMolar(1e-3, 'mg/L', formulaBasis({ Tc: 1, O: 4 }))).toBeNull()
  })

  it('turn back into mol/L exactly', () => {
    const basis = formulaBasis({ Ni: 1 })
    expect(toMolar(fromMolar(3.7e-5, 'µg/L', basis)!, 'µg/L', basis)).toBeCloseTo(3.7e-5, 18)
  })
})

describe('a model\'s scale', () => {
  const model = compile(`system "t"
component H+ pH 7
component Ni^2+ total 1 mmol/L
component NH3 total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14
reaction Ni^2+ + NH3 <=> NiNH3^2+ logbeta 2.7
`).model!

  it('gives each species its formula mass and each component its basis', () => {
    const scale = unitScale(model, { unit: 'mg/L', asElement: true })
    expect(scale.species('NiNH3^2+')).toBeCloseTo(1000 * (58.693 + 14.007 + 3 * 1.008), 6)
    expect(scale.component('NH3')).toBeCloseTo(14.007 * 1000, 6)
    expect(scale.componentUnit('NH3')).toBe('mg/L as N')
    expect(scale.componentUnit('Ni^2+')).toBe('mg/L as Ni')
    const whole = unitScale(model, { unit: 'mg/L', asElement: false })
    expect(whole.component('NH3')).toBeCloseTo(17.031 * 1000, 6)
    expect(whole.componentUnit('NH3')).toBe('mg/L')
  })
})

describe('remembered unit choice', () => {
  it('round-trips and falls back to mol/L on anything unreadable', () => {
    expect(parseUnitPrefs(serializeUnitPrefs({ unit: 'µg/L', asElement: true }))).toEqual({ unit: 'µg/L', asElement: true })
    expect(parseUnitPrefs('{"unit":"furlongs"}')).toEqual({ unit: 'mol/L', asElement: false })
    expect(parseUnitPrefs('not json')).toEqual({ unit: 'mol/L', asElement: false })
    expect(parseUnitPrefs(null)).toEqual({ unit: 'mol/L', asElement: false })
  })
})

describe('hardness as CaCO3', () => {
  it('counts dissolved Ca and Mg as CaCO3 (40.078 + 12.011 + 3 × 15.999 = 100.086 g/mol, IUPAC Standard atomic weights 2021)', () => {
    expect(CACO3_GRAMS).toBeCloseTo(100.086, 9)
    const mol = hardness([{ name: 'Ca^2+', dissolved: 1e-3 }, { name: 'Mg^2+', dissolved: 0.5e-3 }, { name: 'Na+', dissolved: 9 }])!
    expect(mol).toBeCloseTo(1.5e-3, 15)
    // 1.5 mmol/L × 100.086 g/mol = 150.129 mg/L as CaCO3.
    expect(fromMolar(mol, 'mg/L', { grams: CACO3_GRAMS, asElement: null })).toBeCloseTo(150.129, 9)
    expect(hardness([{ name: 'Na+', dissolved: 1e-3 }])).toBeNull()
  })
})
