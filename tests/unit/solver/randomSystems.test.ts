/**
 * Independence of the algorithm: random systems (random totals and
 * constants, fast-check) either converge with every balance closed — checked
 * again by verify.ts in 40-digit arithmetic from the reported activities — and
 * no solid left supersaturated, or fail with a reason. Never NaN. The
 * criteria are the solver design's own (mass and charge balance to 1e-10
 * relative); the chemistry they encode is common practice.
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { MAX_ATTEMPTS, solve } from '../../../server/solver/index'
import { PHASE_BUDGET_FACTOR } from '../../../server/solver/phases'
import type { Model } from '../../../shared/poise/model'
import { buildModel, hydroxide, type ComponentSpec, type FormationSpec } from './modelBuilder'
import { hasNonFinite, verifyResult } from './verify'

const logTotal = fc.double({ min: -12, max: 0, noNaN: true })

const metal = fc.record({
  logT: logTotal,
  logB1: fc.double({ min: 0, max: 12, noNaN: true }),
  logB2: fc.double({ min: 0, max: 20, noNaN: true }),
  hydrolysis: fc.double({ min: -12, max: -6, noNaN: true }),
  pKspHydroxide: fc.double({ min: 10, max: 20, noNaN: true }),
  pKspSalt: fc.double({ min: 3, max: 15, noNaN: true }),
  suppressSalt: fc.boolean(),
})

const ligand = fc.record({
  logT: logTotal,
  charge: fc.constantFrom(-1, -2),
  pKa: fc.double({ min: 2, max: 12, noNaN: true }),
})

const systemSpec = fc.record({
  metals: fc.array(metal, { minLength: 1, maxLength: 3 }),
  ligands: fc.array(ligand, { minLength: 1, maxLength: 2 }),
  proton: fc.oneof(
    fc.constant({ mode: 'balance' as const, value: 0 }),
    fc.record({ mode: fc.constant('pH' as const), value: fc.double({ min: 1, max: 13, noNaN: true }) }),
  ),
  salt: fc.double({ min: -6, max: -1, noNaN: true }),
  activity: fc.constantFrom('ideal' as const, 'davies' as const),
})

type Spec = typeof systemSpec extends fc.Arbitrary<infer T> ? T : never

function toModel(spec: Spec): Model {
  const components: ComponentSpec[] = [
    { name: 'H+', charge: 1, mode: spec.proton.mode, value: spec.proton.value },
    { name: 'Na+', charge: 1, mode: 'total', value: 10 ** spec.salt },
    { name: 'Cl-', charge: -1, mode: 'total', value: 10 ** spec.salt },
  ]
  const species: FormationSpec[] = [hydroxide()]
  const solids: FormationSpec[] = []
  spec.ligands.forEach((l, k) => {
    const L = `L${k}`
    components.push({ name: L, charge: l.charge, mode: 'total', value: 10 ** l.logT })
    species.push({ name: `H${L}`, charge: l.charge + 1, nu: { 'H+': 1, [L]: 1 }, logK: l.pKa })
  })
  spec.metals.forEach((m, k) => {
    const M = `M${k}`
    components.push({ name: M, charge: 2, mode: 'total', value: 10 ** m.logT })
    species.push({ name: `${M}OH`, charge: 1, nu: { [M]: 1, 'H+': -1 }, logK: m.hydrolysis })
    const L = 'L0'
    const z = spec.ligands[0].charge
    species.push({ name: `${M}${L}`, charge: 2 + z, nu: { [M]: 1, [L]: 1 }, logK: m.logB1 })
    species.push({ name: `${M}${L}2`, charge: 2 + 2 * z, nu: { [M]: 1, [L]: 2 }, logK: m.logB2 })
    // M(OH)2(s) <=> M + 2 OH-: over the components H+ and M, logK = pKsp − 2 pKw.
    solids.push({ name: `${M}(OH)2(s)`, nu: { [M]: 1, 'H+': -2 }, logK: m.pKspHydroxide - 28 })
    solids.push({ name: `${M}${L}(s)`, nu: { [M]: 1, [L]: 1 }, logK: m.pKspSalt, suppressed: m.suppressSalt })
  })
  return buildModel({ activity: spec.activity, components, species, solids })
}

describe('random systems', () => {
  it('converge with every balance closed in high precision, or fail with a reason', () => {
    let converged = 0
    fc.assert(fc.property(systemSpec, (spec) => {
      const model = toModel(spec)
      const r = solve(model, { maxIterations: 400 })
      expect(hasNonFinite(r)).toBe(false)
      // Bounded work: at most MAX_ATTEMPTS attempts of PHASE_BUDGET_FACTOR × 400 iterations each (SolveOptions).
      expect(r.iterations).toBeLessThanOrEqual(400 * PHASE_BUDGET_FACTOR * MAX_ATTEMPTS)
      if (!r.converged) {
        expect(r.reason).toMatch(/\w/)
        return
      }
      converged++
      const v = verifyResult(model, r)
      expect(v.worstBalance, `balance of ${v.worstBalanceName}`).toBeLessThan(1e-10)
      expect(v.worstSupersaturation).toBeLessThanOrEqual(1e-8)
      expect(v.worstPresentSI).toBeLessThan(1e-8)
      expect(v.negativeAmount).toBe(false)
      expect(r.residuals.maxScaled).toBeLessThan(1e-10)
    }), { numRuns: 150, seed: 20261201 })
    // The generator stays in physically sensible ranges: nearly all must converge.
    expect(converged).toBeGreaterThan(140)
  }, 120_000)
})
