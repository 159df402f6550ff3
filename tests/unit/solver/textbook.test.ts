/**
 * Worked results every aquatic-chemistry textbook carries, recalled from
 * memory (the figures, not a page): pH of 0.1 M acetic acid and calcite in
 * water open to the air.
 */
import { describe, expect, it } from 'vitest'
import { solve } from '../../../server/solver/index'
import { buildModel, hydroxide, species } from './modelBuilder'

describe('textbook worked results (from memory)', () => {
  // 0.1 M acetic acid, pKa 4.76: pH ≈ 2.88 (from memory; the classic
  // √(Ka C) result, e.g. in Harris, Quantitative Chemical Analysis).
  it('0.1 M acetic acid has pH 2.88', () => {
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'balance', value: 0 }, { name: 'CH3COO-', charge: -1, mode: 'total', value: 0.1 }],
      species: [hydroxide(), { name: 'CH3COOH', nu: { 'H+': 1, 'CH3COO-': 1 }, logK: 4.76 }],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(r.pH).toBeCloseTo(2.88, 2)
  })

  // Calcite in pure water open to air at pCO2 = 10^-3.5 atm: pH ≈ 8.3 and
  // dissolved Ca ≈ 0.5 mmol/L (from memory; Stumm & Morgan, Aquatic Chemistry,
  // the open CaCO3–CO2–H2O system). Constants from memory: log KH −1.47,
  // pKa1 6.35, pKa2 10.33, pKsp 8.48.
  it('calcite open to the air: pH 8.3, about 0.5 mmol/L dissolved', () => {
    const model = buildModel({
      activity: 'davies',
      components: [
        { name: 'H+', charge: 1, mode: 'balance', value: 0 },
        { name: 'CO2(g)', charge: 0, mode: 'pressure', value: 10 ** -3.5, phase: 'g' },
        { name: 'CaCO3(s)', charge: 0, mode: 'excess', value: 0, phase: 's' },
      ],
      species: [
        hydroxide(),
        { name: 'H2CO3', nu: { 'CO2(g)': 1 }, logK: -1.47 },
        { name: 'HCO3-', charge: -1, nu: { 'CO2(g)': 1, 'H+': -1 }, logK: -1.47 - 6.35 },
        { name: 'CO3^2-', charge: -2, nu: { 'CO2(g)': 1, 'H+': -2 }, logK: -1.47 - 6.35 - 10.33 },
        // CaCO3(s) <=> Ca^2+ + CO3^2-: log[Ca] = −8.48 − log[CO3], with CO3 from the gas.
        { name: 'Ca^2+', charge: 2, nu: { 'CaCO3(s)': 1, 'CO2(g)': -1, 'H+': 2 }, logK: -8.48 + 1.47 + 6.35 + 10.33 },
      ],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(r.pH).toBeGreaterThan(8.2)
    expect(r.pH).toBeLessThan(8.4)
    const dissolved = r.solids.find((s) => s.name === 'CaCO3(s)')!
    expect(dissolved.present).toBe(true)
    expect(dissolved.amount).toBeGreaterThan(0.3e-3)
    expect(dissolved.amount).toBeLessThan(0.7e-3)
    // The amount dissolved is the calcium in solution.
    expect(dissolved.amount).toBeCloseTo(species(r, 'Ca^2+'), 15)
    expect(r.components.find((c) => c.name === 'CaCO3(s)')!.dissolved).toBeCloseTo(dissolved.amount, 15)
  })
})
