/**
 * The solver's shortcuts must not show in the answers: solids of different
 * metals joining in one round from estimated amounts, and sweep points
 * started from a parabola through the previous ones, give what the closed
 * forms and independent cold solves give.
 */
import { describe, expect, it } from 'vitest'
import { solve, sweep } from '../../../server/solver/index'
import type { Model } from '../../../shared/poise/model'
import { buildModel, hydroxide, species } from './modelBuilder'
import { verifyResult } from './verify'

// pKsp of Cu(OH)2 19.66 and of Zn(OH)2 ~16.5 (from memory);
// pKw 14. Written as formation from the components: M^2+ − 2 H+ with
// log K = pKsp − 2 pKw.
const CU_PKSP = 19.66
const ZN_PKSP = 16.5

function twoHydroxides(pH: number, extra: Partial<Parameters<typeof buildModel>[0]> = {}): Model {
  return buildModel({
    components: [
      { name: 'H+', charge: 1, mode: 'pH', value: pH },
      { name: 'Cu^2+', charge: 2, mode: 'total', value: 1e-3 },
      { name: 'Zn^2+', charge: 2, mode: 'total', value: 2e-3 },
    ],
    species: [hydroxide()],
    solids: [
      { name: 'Cu(OH)2(s)', nu: { 'Cu^2+': 1, 'H+': -2 }, logK: CU_PKSP - 28 },
      { name: 'Zn(OH)2(s)', nu: { 'Zn^2+': 1, 'H+': -2 }, logK: ZN_PKSP - 28 },
    ],
    ...extra,
  })
}

describe('solver shortcuts', () => {
  // At fixed pH with ideal activities each metal's free ion is fixed by its
  // solubility product, [M] = Ksp / [OH]² (common practice), and the rest of
  // its total is solid.
  it('precipitates two hydroxides of different metals together at their solubility products', () => {
    const model = twoHydroxides(10)
    const r = solve(model)
    expect(r.converged).toBe(true)
    const [cu, zn] = r.solids
    expect(cu!.present && zn!.present).toBe(true)
    const cuFree = 10 ** (-CU_PKSP + 8)
    const znFree = 10 ** (-ZN_PKSP + 8)
    expect(Math.log10(species(r, 'Cu^2+'))).toBeCloseTo(-CU_PKSP + 8, 9)
    expect(Math.log10(species(r, 'Zn^2+'))).toBeCloseTo(-ZN_PKSP + 8, 9)
    expect(cu!.amount / (1e-3 - cuFree)).toBeCloseTo(1, 9)
    expect(zn!.amount / (2e-3 - znFree)).toBeCloseTo(1, 9)
    expect(verifyResult(model, r).worstBalance).toBeLessThan(1e-10)
  })

  it('leaves out a hydroxide whose metal stays dissolved, while the other precipitates', () => {
    // At pH 7: SI(Zn(OH)2) = log[Zn] + 2 pH − 2 pKw + pKsp = log 2e-3 + 2.5 ≈ −0.199 with all zinc
    // dissolved, while copper at 1e-3 would stand at SI 2.66 (same rule).
    const model = twoHydroxides(7)
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(r.solids[0]!.present).toBe(true)
    expect(r.solids[1]!.present).toBe(false)
    expect(r.solids[1]!.saturationIndex).toBeCloseTo(Math.log10(2e-3) + ZN_PKSP - 14, 9)
    expect(species(r, 'Zn^2+') / 2e-3).toBeCloseTo(1, 12)
    expect(verifyResult(model, r).worstBalance).toBeLessThan(1e-10)
  })

  it('gives at every point of a fine pH sweep what a cold solve at that pH gives, solids appearing on the way', () => {
    const values = Array.from({ length: 41 }, (_, k) => 5 + 0.15 * k)
    const model = twoHydroxides(5, { sweep: { variable: 'pH', component: null, values } })
    const out = sweep(model)
    expect(out.points.every((p) => p.converged)).toBe(true)
    // Each hydroxide joins at the first point past the pH where its SI reaches 0 with the whole
    // total dissolved: pH = (2 pKw − pKsp − log T) / 2 (same rule as above), 5.67 for Cu, 7.10 for Zn.
    const onset = (pKsp: number, total: number) => (28 - pKsp - Math.log10(total)) / 2
    const firstPast = (pH: number) => values.findIndex((v) => v > pH)
    expect(out.points.findIndex((p) => p.solids[0]!.present)).toBe(firstPast(onset(CU_PKSP, 1e-3)))
    expect(out.points.findIndex((p) => p.solids[1]!.present)).toBe(firstPast(onset(ZN_PKSP, 2e-3)))
    out.points.forEach((p, k) => {
      const cold = solve(twoHydroxides(values[k]!))
      expect(p.solids.map((s) => s.present)).toEqual(cold.solids.map((s) => s.present))
      p.species.forEach((s, i) => expect(Math.abs(s.log10! - cold.species[i]!.log10!)).toBeLessThan(1e-9))
    })
  })
})
