/**
 * The hand method beside the exact answer. The closed forms are those of the
 * side-reaction (α) coefficient method: α(M) = 1 / (1 + β1 [L'] + β2 [L']²)
 * with the free ligand [L'] = C_L / (1 + [H]/Ka), and the conditional
 * solubility of a 1:1 salt S = √(Ksp / (α(M) α(A))) (A. Ringbom,
 * "Complexation in Analytical Chemistry", 1963, the α-coefficient method;
 * from memory). Ideal solutions at a fixed pH, so the exact answer differs
 * only through the assumptions the method makes.
 */
import { describe, expect, it } from 'vitest'
import { solve } from '../../../server/solver/index'
import { compile } from '../../../shared/poise/index'
import { shortcutReasons } from '../../../shared/results/shortcut'

// Demo constants (invented round numbers for the checks).
const complexes = (metal: string, ligand: string) => compile(`system "A metal with a two-step ligand"
activity ideal
component H+ pH 9
component Zn^2+ total ${metal} mmol/L
component C2H3O2- total ${ligand} mmol/L
reaction H2O <=> H+ + OH- pKw 14 cite "demo"
reaction C2H4O2 <=> C2H3O2- + H+ pKa 9.5 cite "demo"
reaction Zn^2+ + C2H3O2- <=> ZnC2H3O2+ logbeta 4 cite "demo"
reaction Zn^2+ + 2 C2H3O2- <=> Zn(C2H3O2)2 logbeta 7 cite "demo"
`).model!

describe('α of a metal with a two-step ligand at fixed pH', () => {
  it('is the closed form, and close to the exact answer when the ligand is in excess', () => {
    const result = solve(complexes('0.001', '100'))
    expect(result.converged).toBe(true)
    const h = 1e-9
    const ligand = 0.1 / (1 + h / 10 ** -9.5)
    const alpha = 1 / (1 + 1e4 * ligand + 1e7 * ligand ** 2)
    const metal = result.shortcut!.components.find((c) => c.name === 'Zn^2+')!
    expect(metal.alphaFree).toBeCloseTo(alpha, 15)
    expect(metal.alphaFree / alpha).toBeCloseTo(1, 12)
    expect(metal.freeEstimate).toBeCloseTo(alpha * result.components.find((c) => c.name === 'Zn^2+')!.dissolved!, 18)
    // 1 µmol/L metal in 100 mmol/L ligand: the free ligand barely moves, the estimate holds to 0.01 %.
    expect(Math.abs(metal.factor - 1)).toBeLessThan(1e-4)
    expect(shortcutReasons(complexes('0.001', '100'), result, metal)).toEqual([])
  })

  it('fails by ligand depletion when the metal takes up the ligand, and says so', () => {
    const model = complexes('10', '12')
    const result = solve(model)
    const metal = result.shortcut!.components.find((c) => c.name === 'Zn^2+')!
    // Far from 1: the hand method takes 12 mmol/L of ligand as free, most is bound.
    expect(metal.factor).toBeLessThan(0.5)
    const reasons = shortcutReasons(model, result, metal)
    expect(reasons[0]).toMatch(/^ligand depletion: C2H3O2- is bound up/)
  })
})

describe('conditional solubility of a sparingly soluble 1:1 salt', () => {
  const model = compile(`system "A salt of a weak acid"
activity ideal
component H+ pH 9
component Ca^2+ total 1 mmol/L
component C2O4^2- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14 cite "demo"
reaction HC2O4- <=> C2O4^2- + H+ pKa 10 cite "demo"
reaction CaC2O4(s) <=> Ca^2+ + C2O4^2- pKsp 8 cite "demo"
`).model!
  const result = solve(model)

  it('is √(Ksp / (α(M) α(A))) at the pH, and equals the exact dissolved amount', () => {
    expect(result.solids.find((s) => s.name === 'CaC2O4(s)')!.present).toBe(true)
    const alphaA = 1 / (1 + 1e-9 / 1e-10)
    const closed = Math.sqrt(1e-8 / (1 * alphaA))
    const salt = result.shortcut!.solids.find((s) => s.name === 'CaC2O4(s)')!
    expect(salt.solubilityEstimate / closed).toBeCloseTo(1, 12)
    // Equal totals of M and A: both dissolved totals are S exactly; no assumption of the method fails here.
    expect(salt.solubilityExact / closed).toBeCloseTo(1, 8)
    expect(salt.factor).toBeCloseTo(1, 8)
  })
})
