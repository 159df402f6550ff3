/**
 * Extreme ranges: a solid with Ksp near 1e-50 and totals from 1e-12 to
 * 5 mol/L. Every balance is re-verified in 40-digit arithmetic (verify.ts).
 */
import { describe, expect, it } from 'vitest'
import { solve } from '../../../server/solver/index'
import { buildModel, hydroxide, species } from './modelBuilder'
import { hasNonFinite, verifyResult } from './verify'

describe('extreme ranges', () => {
  // A 2:1 sulfide-like salt M2S(s) with pKsp 50 (about 50 for Ag2S,
  // from memory; here with S^2- itself as the component). With an excess
  // of M the free S^2- follows from Ksp = [M]²[S]: [S] = Ksp / [M]² (the
  // solubility product, common practice).
  it.each([1e-12, 1e-6, 1e-3, 1, 5])('Ksp 1e-50 with the metal total %s mol/L', (MT) => {
    const ST = MT / 4
    const model = buildModel({
      components: [{ name: 'M+', charge: 1, mode: 'total', value: MT }, { name: 'S^2-', charge: -2, mode: 'total', value: ST }],
      solids: [{ name: 'M2S(s)', nu: { 'M+': 2, 'S^2-': 1 }, logK: 50 }],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(hasNonFinite(r)).toBe(false)
    const solid = r.solids[0]
    expect(solid.present).toBe(true)
    // Nearly all sulfide precipitates; M left = MT − 2 ST = MT/2.
    expect(solid.amount / ST).toBeCloseTo(1, 10)
    const m = species(r, 'M+')
    expect(m / (MT / 2)).toBeCloseTo(1, 10)
    const s = r.species.find((x) => x.name === 'S^2-')!
    expect(s.log10).toBeCloseTo(-50 - 2 * Math.log10(MT / 2), 8)
    const v = verifyResult(model, r)
    expect(v.worstBalance).toBeLessThan(1e-10)
    expect(Math.abs(v.worstPresentSI)).toBeLessThan(1e-8)
  })

  // Weak acid across twelve orders of magnitude of total, with water: the
  // proton condition must still close (exact cubic, see closedForms.test.ts).
  it.each([1e-12, 1e-9, 1e-6, 1e-3, 1, 5])('acetic acid at %s mol/L closes every balance', (C) => {
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'balance', value: 0 }, { name: 'CH3COO-', charge: -1, mode: 'total', value: C }],
      species: [hydroxide(), { name: 'CH3COOH', nu: { 'H+': 1, 'CH3COO-': 1 }, logK: 4.76 }],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    const v = verifyResult(model, r)
    expect(v.worstBalance).toBeLessThan(1e-10)
    // A trace of acid leaves water neutral; 5 M is strongly acidic (pH ≈ ½(pKa − log C) ≈ 2.03).
    if (C <= 1e-9) expect(r.pH).toBeCloseTo(7, 2)
    if (C === 5) expect(r.pH).toBeCloseTo(0.5 * (4.76 - Math.log10(5)), 2)
  })

  // A component with total 0 whose species all hold it positively is absent:
  // its species come out as zero, with no NaN or infinity.
  it('reports a component with zero total as absent', () => {
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'pH', value: 7 }, { name: 'Cu^2+', charge: 2, mode: 'total', value: 0 }, { name: 'Cl-', charge: -1, mode: 'total', value: 1e-3 }],
      species: [hydroxide(), { name: 'CuCl+', charge: 1, nu: { 'Cu^2+': 1, 'Cl-': 1 }, logK: 0.4 }],
      solids: [{ name: 'Cu(OH)2(s)', nu: { 'Cu^2+': 1, 'H+': -2 }, logK: 19.66 - 28 }],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(hasNonFinite(r)).toBe(false)
    expect(species(r, 'Cu^2+')).toBe(0)
    expect(r.solids[0].present).toBe(false)
    expect(r.components.find((c) => c.name === 'Cu^2+')!.total).toBe(0)
  })
})
