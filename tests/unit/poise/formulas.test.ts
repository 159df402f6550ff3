import { describe, expect, it } from 'vitest'
import { parseFormula, molarMassOf, formatSpecies } from '../../../shared/poise/index'

describe('formula composition and charge', () => {
  // Composition and charge follow from the formulas as chemists write them (common practice).
  const table: [string, string, Record<string, number>, number, string][] = [
    ['Cu(NH3)4^2+', 'Cu(NH3)4^2+', { Cu: 1, N: 4, H: 12 }, 2, 'aq'],
    ['Fe^3+', 'Fe^3+', { Fe: 1 }, 3, 'aq'],
    ['SO4^2-', 'SO4^2-', { S: 1, O: 4 }, -2, 'aq'],
    ['CaCO3(s)', 'CaCO3(s)', { Ca: 1, C: 1, O: 3 }, 0, 's'],
    ['CH3COOH', 'CH3COOH', { C: 2, H: 4, O: 2 }, 0, 'aq'],
    ['Al(OH)4-', 'Al(OH)4-', { Al: 1, O: 4, H: 4 }, -1, 'aq'],
    ['Ca5(PO4)3OH(s)', 'Ca5(PO4)3OH(s)', { Ca: 5, P: 3, O: 13, H: 1 }, 0, 's'],
    ['CaSO4·2H2O(s)', 'CaSO4·2H2O(s)', { Ca: 1, S: 1, O: 6, H: 4 }, 0, 's'],
    ['CaSO4:2H2O(s)', 'CaSO4·2H2O(s)', { Ca: 1, S: 1, O: 6, H: 4 }, 0, 's'],
    ['CuSO4·5H2O(s)', 'CuSO4·5H2O(s)', { Cu: 1, S: 1, O: 9, H: 10 }, 0, 's'],
    ['Ca²⁺', 'Ca^2+', { Ca: 1 }, 2, 'aq'],
    ['SO₄²⁻', 'SO4^2-', { S: 1, O: 4 }, -2, 'aq'],
    ['Hg2^2+', 'Hg2^2+', { Hg: 2 }, 2, 'aq'],
    ['I3^-', 'I3^-', { I: 3 }, -1, 'aq'],
    ['Fe(OH)2^+', 'Fe(OH)2+', { Fe: 1, O: 2, H: 2 }, 1, 'aq'],
    ['NH4+', 'NH4+', { N: 1, H: 4 }, 1, 'aq'],
    ['CO2(g)', 'CO2(g)', { C: 1, O: 2 }, 0, 'g'],
    ['PO4^3-', 'PO4^3-', { P: 1, O: 4 }, -3, 'aq'],
    ['Fe(CN)6^4-', 'Fe(CN)6^4-', { Fe: 1, C: 6, N: 6 }, -4, 'aq'],
  ]
  for (const [text, name, elements, charge, phase] of table) {
    it(`${text} → ${name}`, () => {
      const r = parseFormula(text)
      expect(r.problem).toBeNull()
      expect(r.formula).toMatchObject({ name, elements, charge, phase })
    })
  }

  it('formats a single charge after a lone counted element with a caret, so it cannot read as Ca2+', () => {
    expect(formatSpecies('Hg2', 1, 'aq')).toBe('Hg2^+')
    expect(formatSpecies('NH4', 1, 'aq')).toBe('NH4+')
    expect(formatSpecies('Cu', 2, 'aq')).toBe('Cu^2+')
  })
})

describe('wrong charge notations are errors with the caret form as a fix', () => {
  const cases: [string, string][] = [['Ca+2', 'Ca^2+'], ['Ca2+', 'Ca^2+'], ['Fe+++', 'Fe^3+'], ['Cu++', 'Cu^2+'], ['SO4--', 'SO4^2-'], ['Cu^+2', 'Cu^2+'], ['Fe+3', 'Fe^3+']]
  for (const [text, fix] of cases) {
    it(`${text} → ${fix}`, () => {
      const r = parseFormula(text)
      expect(r.formula).toBeNull()
      expect(r.problem?.code).toBe('P012')
      expect(r.problem?.message).toContain(fix)
      expect(r.problem?.fixes?.[0]).toBe(fix)
    })
  }
  it('rejects unknown element symbols and unclosed brackets', () => {
    expect(parseFormula('Xy2').problem?.code).toBe('P011')
    expect(parseFormula('Cu(NH3').problem?.code).toBe('P010')
    expect(parseFormula('Ca^2+(s)').problem?.code).toBe('P010')
  })
})

describe('molar masses from IUPAC standard atomic weights', () => {
  // Source: IUPAC CIAAW standard atomic weights, abridged/conventional values
  // (H 1.008, C 12.011, N 14.007, O 15.999, Na 22.990, S 32.06, Cl 35.45,
  // Ca 40.078, Cu 63.546); expected sums computed by hand from them.
  const cases: [string, number][] = [
    ['H2O', 18.015],
    ['NaCl', 58.44],
    ['CaCO3(s)', 100.086],
    ['CuSO4·5H2O(s)', 249.681],
    ['CH3COOH', 60.052],
    ['Cu(NH3)4^2+', 131.67],
  ]
  for (const [text, mass] of cases) {
    it(`${text} ≈ ${mass} g/mol`, () => {
      expect(parseFormula(text).formula?.molarMass).toBeCloseTo(mass, 2)
    })
  }
  it('has no molar mass for an element without a standard atomic weight (Tc)', () => {
    expect(molarMassOf({ Tc: 1, O: 4 })).toBeNull()
  })
})

describe('a caret charge without a sign', () => {
  it('offers both signs', () => {
    const r = parseFormula('Fe^3')
    expect(r.problem?.code).toBe('P012')
    expect(r.problem?.fixes).toEqual(['Fe^3+', 'Fe^3-'])
  })
})
