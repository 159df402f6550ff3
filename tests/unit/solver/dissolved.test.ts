/**
 * Each component's dissolved total (`components[].dissolved`) is its mass
 * balance minus what the solids hold: total = dissolved + Σ ν·(mol of each
 * precipitated solid), and dissolved = Σ ν·c over the aqueous species
 * (recounted here from the species, not read from the solver's sums).
 * Mass balance: common practice.
 */
import { describe, expect, it } from 'vitest'
import { solve } from '../../../server/solver/index'
import { compile } from '../../../shared/poise/index'
import { dissolvedTotal } from '../../../shared/results/share'

// Demo constants (from memory, near the usual handbook values).
const TEXT = `system "Nickel hydroxide out of a rinse at pH 10"
component H+ pH 10
component Ni^2+ total 1 mmol/L
component SO4^2- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00
reaction Ni^2+ + H2O <=> NiOH+ + H+ logK -9.86
reaction Ni(OH)2(s) <=> Ni^2+ + 2 OH- pKsp 15.2
`

describe('dissolved totals', () => {
  const model = compile(TEXT).model!
  const result = solve(model)

  it('are the total minus the precipitate, and the sum over the aqueous species', () => {
    expect(result.converged, result.reason).toBe(true)
    const solid = result.solids.find((s) => s.name === 'Ni(OH)2(s)')!
    expect(solid.present).toBe(true)
    const precipitated = solid.precipitated ?? solid.amount
    expect(precipitated).toBeGreaterThan(0.9e-3)
    const nickel = result.components.find((c) => c.name === 'Ni^2+')!
    expect(nickel.total).toBeCloseTo(1e-3, 12)
    // Ni(OH)2(s) holds one Ni each: dissolved Ni = 1 mmol/L − precipitated.
    expect(nickel.dissolved).toBeDefined()
    expect(Math.abs(nickel.dissolved! - (1e-3 - precipitated))).toBeLessThan(1e-12)
    expect(nickel.dissolved!).toBeLessThan(1e-5)
    // Recounted from the species: free Ni2+ plus NiOH+.
    const recount = dissolvedTotal(result, model, 'Ni^2+')
    expect(Math.abs(nickel.dissolved! - recount) / recount).toBeLessThan(1e-12)
    // The free ion is only part of the dissolved total.
    expect(nickel.freeConcentration ?? nickel.free).toBeLessThan(nickel.dissolved!)
  })

  it('equal the total for a component no solid holds', () => {
    const sulfate = result.components.find((c) => c.name === 'SO4^2-')!
    expect(sulfate.dissolved).toBeCloseTo(1e-3, 15)
    expect(sulfate.total).toBeCloseTo(1e-3, 15)
  })
})
