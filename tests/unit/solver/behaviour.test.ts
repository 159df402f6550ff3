/**
 * What a user notices beyond single numbers: solids joining and leaving,
 * suppressed solids, gases, sweeps with continuation, and bad models that
 * must give a reason instead of a crash.
 */
import { describe, expect, it } from 'vitest'
import { solve, sweep, SOLVER_VERSION } from '../../../server/solver/index'
import type { Model } from '../../../shared/poise/model'
import { buildModel, hydroxide, species } from './modelBuilder'
import { hasNonFinite, verifyResult } from './verify'

// Carbonate with calcium (from memory): pKa 6.35, 10.33; calcite pKsp 8.48.
function calciumCarbonate(extra: Partial<Parameters<typeof buildModel>[0]> = {}): Model {
  return buildModel({
    components: [
      { name: 'H+', charge: 1, mode: 'balance', value: 0 },
      { name: 'Ca^2+', charge: 2, mode: 'total', value: 0.01 },
      { name: 'CO3^2-', charge: -2, mode: 'total', value: 0.01 },
      { name: 'Na+', charge: 1, mode: 'total', value: 0.02 },
      { name: 'Cl-', charge: -1, mode: 'total', value: 0.02 },
    ],
    species: [hydroxide(), { name: 'HCO3-', charge: -1, nu: { 'CO3^2-': 1, 'H+': 1 }, logK: 10.33 },
      { name: 'H2CO3', nu: { 'CO3^2-': 1, 'H+': 2 }, logK: 16.68 }],
    solids: [{ name: 'CaCO3(s)', nu: { 'Ca^2+': 1, 'CO3^2-': 1 }, logK: 8.48 }],
    ...extra,
  })
}

describe('solids', () => {
  it('precipitates a supersaturated solid until its saturation index is zero', () => {
    const model = calciumCarbonate()
    const r = solve(model)
    expect(r.converged).toBe(true)
    const calcite = r.solids[0]
    expect(calcite.present).toBe(true)
    expect(Math.abs(calcite.saturationIndex!)).toBeLessThan(1e-10)
    // Ksp = [Ca][CO3] at saturation (ideal activities).
    expect(Math.log10(species(r, 'Ca^2+') * species(r, 'CO3^2-'))).toBeCloseTo(-8.48, 9)
    expect(verifyResult(model, r).worstBalance).toBeLessThan(1e-10)
  })

  it('never precipitates a suppressed solid but still reports its saturation index', () => {
    const model = calciumCarbonate({ solids: [{ name: 'CaCO3(s)', nu: { 'Ca^2+': 1, 'CO3^2-': 1 }, logK: 8.48, suppressed: true }] })
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(r.solids[0].present).toBe(false)
    expect(r.solids[0].suppressed).toBe(true)
    expect(r.solids[0].saturationIndex).toBeGreaterThan(1)
  })

  it('dissolves the solid again along a pH sweep when the acid takes the carbonate', () => {
    const model = calciumCarbonate({ sweep: { variable: 'pH', component: null, values: [10, 9, 8, 7, 6, 5, 4] } })
    const out = sweep(model)
    expect(out.variable).toBe('pH')
    expect(out.points).toHaveLength(7)
    out.points.forEach((p, k) => {
      expect(p.converged).toBe(true)
      expect(p.pH).toBe(out.values[k])
      // At each point H+ is held, so the charge balance is not an equation there.
      const held = { ...model, components: model.components.map((c) => (c.name === 'H+' ? { ...c, mode: 'pH' as const, value: out.values[k] } : c)) }
      expect(verifyResult(held, p).worstBalance).toBeLessThan(1e-10)
    })
    expect(out.points[0].solids[0].present).toBe(true)
    expect(out.points[6].solids[0].present).toBe(false)
    expect(out.points[6].solids[0].saturationIndex).toBeLessThan(0)
  })

  it('obeys the phase rule: a solid of fixed components only is reported, not precipitated', () => {
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'pH', value: 12 }, { name: 'Mg^2+', charge: 2, mode: 'free', value: 0.1 }],
      species: [hydroxide()],
      solids: [{ name: 'Mg(OH)2(s)', nu: { 'Mg^2+': 1, 'H+': -2 }, logK: 11.25 - 28 }],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(r.solids[0].present).toBe(false)
    expect(r.solids[0].saturationIndex).toBeCloseTo(11.25 - 28 + Math.log10(0.1) + 24, 10)
    expect(r.warnings?.some((w) => w.includes('cannot precipitate'))).toBe(true)
  })
})

describe('competing solids', () => {
  // Two solids of one metal at fixed pH: only the less soluble can be present
  // at equilibrium (phase rule: one total component, one solid), and the
  // other is left undersaturated (common practice). Demo constants.
  it('keeps only the more stable of two solids that fix the same activity', () => {
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'pH', value: 10 }, { name: 'M^2+', charge: 2, mode: 'total', value: 1e-2 },
        { name: 'L-', charge: -1, mode: 'free', value: 1e-2 }],
      species: [hydroxide()],
      solids: [
        { name: 'M(OH)2(s)', nu: { 'M^2+': 1, 'H+': -2 }, logK: 15 - 28 },
        { name: 'ML2(s)', nu: { 'M^2+': 1, 'L-': 2 }, logK: 12 },
      ],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    const [hydroxideSolid, salt] = r.solids
    // Free M from each solid alone: hydroxide 10^(−15+8) = 1e-7, salt 10^(−12+4) = 1e-8: the salt is more stable.
    expect(salt.present).toBe(true)
    expect(hydroxideSolid.present).toBe(false)
    expect(hydroxideSolid.saturationIndex).toBeCloseTo(-1, 8)
    expect(species(r, 'M^2+')).toBeCloseTo(1e-8, 15)
  })
})

describe('gases and fixed pressures', () => {
  // Henry's law: [H2CO3*] = KH pCO2 with log KH −1.47 (from memory).
  it('reports the partial pressure of a gas that is not a component', () => {
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'pH', value: 5 }, { name: 'CO3^2-', charge: -2, mode: 'total', value: 1e-3 }],
      species: [hydroxide(), { name: 'HCO3-', charge: -1, nu: { 'CO3^2-': 1, 'H+': 1 }, logK: 10.33 },
        { name: 'H2CO3', nu: { 'CO3^2-': 1, 'H+': 2 }, logK: 16.68 }],
      // CO2(g) = H2CO3 − log KH
      gases: [{ name: 'CO2(g)', nu: { 'CO3^2-': 1, 'H+': 2 }, logK: 16.68 + 1.47 }],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    const co2 = r.gases![0]
    expect(co2.log10).toBeCloseTo(Math.log10(species(r, 'H2CO3')) + 1.47, 12)
    expect(co2.pressure).toBeCloseTo(10 ** co2.log10!, 15)
  })

  it('sweeps the pressure of a gas component', () => {
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'balance', value: 0 }, { name: 'CO2(g)', charge: 0, mode: 'pressure', value: 1e-3, phase: 'g' }],
      species: [hydroxide(), { name: 'H2CO3', nu: { 'CO2(g)': 1 }, logK: -1.47 },
        { name: 'HCO3-', charge: -1, nu: { 'CO2(g)': 1, 'H+': -1 }, logK: -1.47 - 6.35 }],
      sweep: { variable: 'pressure', component: 'CO2(g)', values: [1e-4, 1e-3, 1e-2, 1e-1] },
    })
    const out = sweep(model)
    out.points.forEach((p, k) => {
      expect(p.converged).toBe(true)
      expect(species(p, 'H2CO3')).toBeCloseTo(out.values[k] * 10 ** -1.47, 15)
    })
    // pH of CO2-saturated water falls by ½ unit per tenfold pressure (h² ≈ K1 KH p).
    expect(out.points[0].pH - out.points[2].pH).toBeCloseTo(1, 2)
  })
})

describe('sweeps', () => {
  it('replaces a component total along a total sweep and goes on after a failed point', () => {
    const model = calciumCarbonate({ sweep: { variable: 'total', component: 'Ca^2+', values: [1e-4, 1e-3, -1, 1e-2] } })
    const out = sweep(model)
    expect(out.component).toBe('Ca^2+')
    expect(out.points).toHaveLength(4)
    expect(out.points[2].converged).toBe(false)
    expect(out.points[2].reason).toMatch(/negative/)
    for (const k of [0, 1, 3]) {
      expect(out.points[k].converged).toBe(true)
      expect(out.points[k].components.find((c) => c.name === 'Ca^2+')!.total).toBeCloseTo(out.values[k], 14)
    }
  })

  it('holds H+ at each pH of a pH sweep even when its spec is balance', () => {
    const model = calciumCarbonate({ sweep: { variable: 'pH', component: null, values: [6.5, 7.5] } })
    const out = sweep(model)
    expect(out.points.map((p) => p.pH)).toEqual([6.5, 7.5])
  })

  it('reports a sweep on a component the model lacks as failed points', () => {
    const model = calciumCarbonate({ sweep: { variable: 'total', component: 'Zn^2+', values: [1, 2] } })
    const out = sweep(model)
    expect(out.points).toHaveLength(2)
    expect(out.points.every((p) => !p.converged && /Zn\^2\+/.test(p.reason ?? ''))).toBe(true)
  })
})

describe('bad models and limits', () => {
  it('returns a reason instead of throwing for a malformed model', () => {
    const model = calciumCarbonate()
    const broken = { ...model, species: [...model.species, { ...model.species[0], name: 'X', nu: [1] }] }
    const r = solve(broken as Model)
    expect(r.converged).toBe(false)
    expect(r.reason).toMatch(/species X has a stoichiometry/)
    expect(hasNonFinite(r)).toBe(false)
    expect(solve(null as unknown as Model).converged).toBe(false)
  })

  it('stops at the iteration limit with the equation that did not close', () => {
    const r = solve(calciumCarbonate(), { maxIterations: 2 })
    expect(r.converged).toBe(false)
    expect(r.reason).toMatch(/did not close|balance|saturation/)
    expect(hasNonFinite(r)).toBe(false)
  })

  it('says so when the time guard, not the equations, stopped the solve', () => {
    const r = solve(calciumCarbonate(), { timeBudgetMs: 0 })
    expect(r.converged).toBe(false)
    expect(r.reason).toMatch(/time guard .* safety limit/)
    expect(r.reason).toMatch(/fewer sweep points or a smaller system/)
  })

  it('exposes a version string for stored runs', () => {
    expect(SOLVER_VERSION).toMatch(/^\d+\.\d+\.\d+$/)
  })
})
