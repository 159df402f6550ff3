import { describe, expect, it } from 'vitest'
import { compile, parseFormula } from '../../../shared/poise/index'
import { solve } from '../../../server/solver/index'
import { resultCsv } from '../../../shared/results/export'
import { unitScale } from '../../../shared/results/units'

/** A nickel citrate file that names citrate once. Constants from memory (rough values). */
const CITRATE = `system "Nickel citrate with an abbreviation"
abbreviation Cit = C6H5O7
component H+ balance
component Na+ total 6 mmol/L
component Ni^2+ total 1 mmol/L
component Cit^3- total 2 mmol/L
component Cl- total 2 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
reaction HCit^2- <=> Cit^3- + H+ pKa 6.40 cite "from memory"
reaction H2Cit- <=> HCit^2- + H+ pKa 4.76 cite "from memory"
reaction Ni^2+ + Cit^3- <=> NiCit^- logbeta 5.4 cite "from memory"
reaction Ni^2+ + 2 Cit^3- <=> Ni(Cit)2^4- logbeta 7.0 cite "from memory"
`

function messages(source: string): string[] {
  return compile(source).diagnostics.map((d) => `${d.code} line ${d.range.line}: ${d.message}`)
}

const HEAD = 'system "t"\ncomponent H+ balance\ncomponent Na+ total 1 mmol/L\n'

describe('abbreviations', () => {
  it('compile with no diagnostic and keep the names as written', () => {
    const r = compile(CITRATE)
    expect(r.diagnostics).toEqual([])
    const names = r.model!.species.map((s) => s.name)
    expect(names).toEqual(expect.arrayContaining(['Cit^3-', 'HCit^2-', 'H2Cit-', 'NiCit-', 'Ni(Cit)2^4-']))
  })

  it('count the atoms of the abbreviation in the composition, and the charge as written', () => {
    const species = Object.fromEntries(compile(CITRATE).model!.species.map((s) => [s.name, s]))
    expect(species['Cit^3-']).toMatchObject({ elements: { C: 6, H: 5, O: 7 }, charge: -3 })
    expect(species['HCit^2-']).toMatchObject({ elements: { H: 6, C: 6, O: 7 }, charge: -2 })
    expect(species['NiCit-']).toMatchObject({ elements: { Ni: 1, C: 6, H: 5, O: 7 }, charge: -1 })
    expect(species['Ni(Cit)2^4-']).toMatchObject({ elements: { Ni: 1, C: 12, H: 10, O: 14 }, charge: -4 })
  })

  it('give the molar mass of the atoms it stands for', () => {
    // IUPAC (CIAAW) abridged standard atomic weights: C 12.011, H 1.008, O 15.999, Ni 58.693.
    const table = new Map([['Cit', { name: 'Cit', formula: 'C6H5O7', elements: { C: 6, H: 5, O: 7 }, from: 0 }]])
    expect(parseFormula('Cit^3-', table).formula!.molarMass).toBeCloseTo(6 * 12.011 + 5 * 1.008 + 7 * 15.999, 6)
    expect(parseFormula('NiCit-', table).formula!.molarMass).toBeCloseTo(58.693 + 6 * 12.011 + 5 * 1.008 + 7 * 15.999, 6)
    const component = compile(CITRATE).model!.components.find((c) => c.name === 'Cit^3-')!
    expect(component.molarMass).toBeCloseTo(189.099, 3)
    const symbol = compile(CITRATE).symbols.find((s) => s.name === 'Cit')!
    expect(symbol).toMatchObject({ kind: 'abbreviation', stands: 'C6H5O7', elements: { C: 6, H: 5, O: 7 } })
    expect(symbol.molarMass).toBeCloseTo(189.099, 3)
  })

  it('convert a mass concentration through the molar mass of the abbreviated formula', () => {
    const r = compile(CITRATE.replace('component Cit^3- total 2 mmol/L', 'component Cit^3- total 378.198 mg/L'))
    expect(r.diagnostics).toEqual([])
    expect(r.model!.components.find((c) => c.name === 'Cit^3-')!.value).toBeCloseTo(2e-3, 8)
  })

  it('check the element balance of a reaction through the abbreviation', () => {
    const out = messages(CITRATE.replace('reaction HCit^2- <=> Cit^3- + H+ pKa 6.40', 'reaction HCit^2- <=> Cit^3- pKa 6.40'))
    expect(out.some((m) => m.startsWith('P020') && m.includes('H'))).toBe(true)
    const atoms = messages(CITRATE.replace('Ni^2+ + 2 Cit^3- <=> Ni(Cit)2^4-', 'Ni^2+ + Cit^3- <=> Ni(Cit)2^4-'))
    expect(atoms.some((m) => m.startsWith('P020') && m.includes('C'))).toBe(true)
  })

  it('check the charge balance of a reaction through the abbreviation', () => {
    const out = messages(CITRATE.replace('<=> NiCit^- logbeta', '<=> NiCit^2- logbeta'))
    expect(out.some((m) => m.startsWith('P021'))).toBe(true)
  })

  it('solve, and the result and its CSV name the species as written', () => {
    const model = compile(CITRATE).model!
    const result = solve(model)
    expect(result.converged).toBe(true)
    const nickel = result.species.filter((s) => s.name.includes('Ni')).map((s) => s.name)
    expect(nickel).toEqual(expect.arrayContaining(['NiCit-', 'Ni(Cit)2^4-']))
    // The nickel balance holds through the abbreviated species.
    const byName = Object.fromEntries(result.species.map((s) => [s.name, s.concentration]))
    expect(byName['Ni^2+']! + byName['NiCit-']! + byName['Ni(Cit)2^4-']!).toBeCloseTo(1e-3, 9)
    const csv = resultCsv(result, unitScale(model, { unit: 'mol/L', asElement: false }))
    expect(csv).toContain('NiCit-')
    expect(csv).toContain('Ni(Cit)2^4-')
  })

  it('refuse an element symbol, a name that reads as a formula, and a name with a charge', () => {
    expect(messages(`${HEAD}abbreviation Co = C2O4`)).toEqual(['P013 line 4: Co is an element symbol, so it cannot name an abbreviation: choose another name (such as Cox)'])
    expect(messages(`${HEAD}abbreviation CN = C2O4`)[0]).toMatch(/^P013 line 4: CN already reads as a formula \(C N\)/)
    expect(messages(`${HEAD}abbreviation Cit^3- = C6H5O7`)[0]).toMatch(/^P013 line 4: an abbreviation names a group of atoms, with no charge or phase: write `abbreviation Cit = …`/)
    expect(messages(`${HEAD}abbreviation Cit = C6H5O7^3-`)[0]).toMatch(/^P013 line 4: .*write `abbreviation Cit = C6H5O7` and the charge on each species \(Cit\^3-\)/)
  })

  it('refuse a name defined twice and a use above the definition, once each', () => {
    expect(messages(`${HEAD}abbreviation Cit = C6H5O7\nabbreviation Cit = C6H5O7`)).toEqual(['P031 line 5: abbreviation Cit is defined twice (first on line 4): keep one'])
    const early = messages(`${HEAD}component Cit^3- total 1 mmol/L\nreaction HCit^2- <=> Cit^3- + H+ pKa 6.4 cite "m"\nabbreviation Cit = C6H5O7`)
    expect(early).toEqual(['P014 line 4: Cit is used before its abbreviation line (line 6): move `abbreviation Cit = C6H5O7` above its first use'])
  })

  it('say what to add for an unknown abbreviation, and the defined one in other letter case', () => {
    expect(messages(`${HEAD}component Edta^4- total 1 mmol/L`)[0]).toMatch(/^P011 line 4: 'Edta' is neither an element symbol nor an abbreviation of this file: to name a group of atoms, add `abbreviation Edta = FORMULA`/)
    expect(messages(`${HEAD}abbreviation Cit = C6H5O7\ncomponent CIT^3- total 1 mmol/L`)[0]).toMatch(/^P011 line 5: 'CIT' is neither .*did you mean Cit\?/)
  })

  it('report a refused abbreviation once, not again at every use', () => {
    const out = messages(`${HEAD}abbreviation Cit^3- = C6H5O7\ncomponent Cit^3- total 1 mmol/L\nreaction HCit^2- <=> Cit^3- + H+ pKa 6.4 cite "m"`)
    expect(out).toHaveLength(1)
    expect(out[0]).toMatch(/^P013 line 4/)
  })

  it('an all-capital name works inside formulas too', () => {
    const r = compile(`${HEAD}abbreviation EDTA = C10H12N2O8\ncomponent EDTA^4- total 1 mmol/L\nreaction HEDTA^3- <=> EDTA^4- + H+ pKa 10.2 cite "from memory"\nreaction H2O <=> H+ + OH- pKw 14 cite "from memory"`)
    expect(r.diagnostics).toEqual([])
    expect(r.model!.species.find((s) => s.name === 'HEDTA^3-')).toMatchObject({ elements: { H: 13, C: 10, N: 2, O: 8 }, charge: -3 })
  })
})
