/**
 * `ion-size SPECIES N Å`: the ion-size parameter of the extended Debye–Hückel
 * model, carried from the file through the compiled model to the solver.
 */
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { ION_SIZE_TABLE } from '../../../shared/poise/ionSize'
import { solve } from '../../../server/solver/index'
import { debyeHuckelA, debyeHuckelB } from '../../../server/solver/physics'

function saltWater(extra = '', activity = 'debye-huckel'): string {
  return `system "Salt water with a complex"
activity ${activity}
component Na+ total 20 mmol/L
component Cl- total 20 mmol/L
component Zn^2+ total 1 mmol/L
reaction Zn^2+ + Cl- <=> ZnCl+ logbeta 0.4 cite "from memory"
${extra}
`
}

const codesOf = (source: string) => compile(source).diagnostics.map((d) => d.code)

describe('ion sizes in the compiled model', () => {
  it('takes the built-in table, a guess by charge with a warning, or the file’s value', () => {
    const r = compile(saltWater())
    const zncl = r.model!.species.find((s) => s.name === 'ZnCl+')!
    expect(zncl).toMatchObject({ ionSize: 4, ionSizeSource: 'charge' })
    expect(r.model!.species.find((s) => s.name === 'Zn^2+')).toMatchObject({ ionSize: ION_SIZE_TABLE['Zn^2+'], ionSizeSource: 'table' })
    const w107 = r.diagnostics.filter((d) => d.code === 'W107')
    expect(w107).toHaveLength(1)
    expect(w107[0]!.message).toBe('ZnCl+ is not in the built-in ion-size table, so debye-huckel guesses 4 Å from its charge: give its size with `ion-size ZnCl+ N Å`')
    expect(w107[0]!.range.line).toBe(6)

    const given = compile(saltWater('ion-size ZnCl+ 5.5 Å\nion-size Na+ 450 pm'))
    expect(given.diagnostics).toEqual([])
    expect(given.model!.species.find((s) => s.name === 'ZnCl+')).toMatchObject({ ionSize: 5.5, ionSizeSource: 'file' })
    expect(given.model!.species.find((s) => s.name === 'Na+')).toMatchObject({ ionSize: 4.5, ionSizeSource: 'file' })
    expect(given.symbols.find((s) => s.name === 'ZnCl+')!.ionSize).toEqual({ angstrom: 5.5, source: 'file' })
  })

  it('warns about guesses only under debye-huckel', () => {
    expect(codesOf(saltWater('', 'davies'))).toEqual([])
    // (Na+ takes part in nothing when charges count nowhere: W101, not W107.)
    expect(codesOf(saltWater('', 'ideal'))).toEqual(['W101'])
  })

  it('checks the line: a species of the system, dissolved, a length unit, a size in range', () => {
    expect(codesOf(saltWater('ion-size ZnCl+ 5 Å\nion-size Cu^2+ 6 Å'))).toEqual(['P061'])
    expect(codesOf(saltWater('ion-size ZnCl+ 5 Å\nion-size ZnO(s) 6 Å'))).toEqual(['P061'])
    expect(codesOf(saltWater('ion-size ZnCl+ 5 mmol/L'))).toEqual(['W107', 'P050'])
    expect(codesOf(saltWater('ion-size ZnCl+ 5'))).toEqual(['W107', 'P050'])
    expect(codesOf(saltWater('ion-size ZnCl+ 5 Å\nion-size ZnCl+ 6 Å'))).toEqual(['P031'])
    expect(codesOf(saltWater('ion-size ZnCl+ 0 Å'))).toEqual(['W107', 'P083'])
    expect(codesOf(saltWater('ion-size ZnCl+ 15 Å'))).toEqual(['W106'])
    expect(codesOf(saltWater('ion-size ZnCl+ 5 Å\nion-size H2O 3 Å'))).toEqual(['W108'])
    const davies = compile(saltWater('ion-size ZnCl+ 5 Å', 'davies')).diagnostics
    expect(davies.map((d) => d.code)).toEqual(['W108'])
    expect(davies[0]!.message).toContain('used only by `activity debye-huckel`')
  })
})

describe('the solver uses the sizes the file gives', () => {
  // Extended Debye–Hückel: log10 γ = −A z² √I / (1 + B å √I) (the standard form
  // in analytical chemistry texts, e.g. Harris, Quantitative Chemical Analysis,
  // chapter on activity; from memory), with A and B of the solver at 25 °C.
  function gammaCheck(source: string, sizes: Record<string, number>) {
    const r = solve(compile(source).model!)
    expect(r.converged).toBe(true)
    const rootI = Math.sqrt(r.ionicStrength)
    const A = debyeHuckelA(25)
    const B = debyeHuckelB(25)
    for (const [name, a] of Object.entries(sizes)) {
      const s = r.species.find((x) => x.name === name)!
      expect(Math.log10(s.gamma), name).toBeCloseTo((-A * s.charge ** 2 * rootI) / (1 + B * a * rootI), 12)
    }
    return r
  }

  it('changes γ of an ion as the closed form says', () => {
    const byTable = gammaCheck(saltWater(), { 'Na+': 4, 'Zn^2+': 6, 'ZnCl+': 4 })
    const byFile = gammaCheck(saltWater('ion-size Zn^2+ 9 Å\nion-size ZnCl+ 7 Å'), { 'Na+': 4, 'Zn^2+': 9, 'ZnCl+': 7 })
    const gamma = (r: typeof byTable, name: string) => r.species.find((s) => s.name === name)!.gamma
    // A larger ion is screened less: its γ is closer to 1.
    expect(gamma(byFile, 'Zn^2+')).toBeGreaterThan(gamma(byTable, 'Zn^2+') + 0.01)
  })

  it('falls back to the built-in table for a model stored without sizes', () => {
    const model = compile(saltWater()).model!
    for (const s of model.species) { delete s.ionSize; delete s.ionSizeSource }
    gammaCheck(saltWater(), { 'Na+': 4, 'Zn^2+': 6, 'ZnCl+': 4 })
    const r = solve(model)
    const zn = r.species.find((s) => s.name === 'Zn^2+')!
    const rootI = Math.sqrt(r.ionicStrength)
    expect(Math.log10(zn.gamma)).toBeCloseTo((-debyeHuckelA(25) * 4 * rootI) / (1 + debyeHuckelB(25) * 6 * rootI), 12)
  })
})
