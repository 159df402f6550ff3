/**
 * Linear propagation of the constants' ± to one answer, checked against
 * central finite differences of the solver itself: each reaction's log K is
 * moved by ±h (and with it every formation constant chained through it) and
 * the system solved again; σ_y = sqrt(Σ_r (Δy/2h · σ_r)²) (first-order
 * propagation of independent errors, the closed form of the GUM's law of
 * propagation of uncertainty).
 */
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'
import type { Result } from '../../../shared/types/result'
import { solve } from '../../../server/solver/index'

function model(text: string): Model {
  const r = compile(text)
  const errors = r.diagnostics.filter((d) => d.severity === 'error')
  if (errors.length) throw new Error(errors.map((d) => d.message).join('; '))
  return r.model!
}

/** The model with reaction k's log K moved by d (at both temperatures, through every formation that uses it). */
function moved(m: Model, k: number, d: number): Model {
  const out = structuredClone(m)
  out.reactions[k]!.logK += d
  for (const list of [out.species, out.solids, out.gases]) {
    for (const f of list) for (const w of f.reactionWeights ?? []) if (w.reaction === k) { f.logK += w.weight * d; f.logKRef += w.weight * d }
  }
  return out
}

const H = 1e-4

/** σ of read(result) by central differences over every reaction that carries a ±, and the reaction of the largest term. */
function finiteDifference(m: Model, read: (r: Result) => number): { sigma: number; main: string } {
  let total = 0
  let largest = -1
  let main = ''
  m.reactions.forEach((r, k) => {
    if (r.logKUncertainty === null) return
    const up = solve(moved(m, k, H))
    const down = solve(moved(m, k, -H))
    expect(up.converged && down.converged).toBe(true)
    const term = (((read(up) - read(down)) / (2 * H)) * r.logKUncertainty) ** 2
    total += term
    if (term > largest) { largest = term; main = r.equation }
  })
  return { sigma: Math.sqrt(total), main }
}

const species = (name: string) => (r: Result) => r.species.find((s) => s.name === name)!.log10!
const dissolved = (name: string) => (r: Result) => r.components.find((c) => c.name === name)!.dissolved!
const si = (name: string) => (r: Result) => r.solids.find((s) => s.name === name)!.saturationIndex!

/** Linear σ within 1e-4 relative (plus a floor) of the finite differences, and the same main contributor. */
function expectAgrees(linear: { sigma: number; main?: { reaction: string } | null } | undefined, fd: { sigma: number; main: string }) {
  expect(linear).toBeDefined()
  expect(linear!.sigma).toBeGreaterThan(0)
  expect(Math.abs(linear!.sigma - fd.sigma)).toBeLessThan(1e-4 * fd.sigma + 1e-9)
  expect(linear!.main?.reaction).toBe(fd.main)
}

// Constants: acetic acid pKa 4.76, water pKw 14.00, copper–ammonia logK 4.0/3.3,
// NH4+ pKa 9.24, calcite pKsp 8.48, carbonic acid pKa 6.35/10.33 (from memory).
// The ± are invented for the tests.
const monoprotic = `system "Acetic acid, half neutralised"
activity davies
component H+ balance
component CH3COO- total 10 mmol/L
component Na+ total 5 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 ± 0.01 cite "from memory"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 ± 0.05 cite "from memory"
`

const metalLigand = `system "Copper and ammonia"
activity davies
component H+ balance
component Cu^2+ total 1 mmol/L
component NH3 total 20 mmol/L
component NO3- total 2 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
reaction NH4+ <=> NH3 + H+ pKa 9.24 ± 0.02 cite "from memory"
reaction Cu^2+ + NH3 <=> CuNH3^2+ logK 4.0 ± 0.1 cite "from memory"
reaction CuNH3^2+ + NH3 <=> Cu(NH3)2^2+ logK 3.3 +- 0.15 cite "from memory"
`

const undersaturated = `system "Hard water below calcite saturation"
activity davies
component H+ pH 7.2
component Ca^2+ total 1 mmol/L
component CO3^2- total 1 mmol/L
component Cl- total 2 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
reaction HCO3- <=> CO3^2- + H+ pKa 10.33 ± 0.02 cite "from memory"
reaction H2CO3 <=> HCO3- + H+ pKa 6.35 ± 0.03 cite "from memory"
reaction CaCO3(s) <=> Ca^2+ + CO3^2- Ksp 3.3e-9 ± 0.5e-9 cite "from memory"
`

describe('linear propagation of the constants’ ± to one solve', () => {
  it('gives a monoprotic acid’s pH and species the ± that finite differences of the solver give', () => {
    const m = model(monoprotic)
    const r = solve(m)
    expect(r.converged).toBe(true)
    expectAgrees(r.pHUncertainty, finiteDifference(m, (x) => x.pH))
    // Half neutralised, pH ≈ pKa: the pKa's ± passes almost one to one into the pH (Henderson–Hasselbalch, closed form).
    expect(r.pHUncertainty!.sigma).toBeGreaterThan(0.045)
    expect(r.pHUncertainty!.sigma).toBeLessThan(0.052)
    expect(r.pHUncertainty!.main).toEqual({ reaction: 'CH3COOH <=> CH3COO- + H+', share: expect.any(Number) })
    for (const name of ['CH3COOH', 'CH3COO-', 'OH-']) expectAgrees(r.species.find((s) => s.name === name)!.log10Uncertainty, finiteDifference(m, species(name)))
    expect(r.uncertainty).toEqual({ method: 'linear', constants: [
      { reaction: 'H2O <=> H+ + OH-', kind: 'pKw', logKUncertainty: 0.01 },
      { reaction: 'CH3COOH <=> CH3COO- + H+', kind: 'pKa', logKUncertainty: 0.05 },
    ] })
  })

  it('gives a metal–ligand system’s free metal, complexes and dissolved totals their ±', () => {
    const m = model(metalLigand)
    const r = solve(m)
    expect(r.converged).toBe(true)
    for (const name of ['Cu^2+', 'CuNH3^2+', 'Cu(NH3)2^2+', 'NH4+']) {
      expectAgrees(r.species.find((s) => s.name === name)!.log10Uncertainty, finiteDifference(m, species(name)))
    }
    expectAgrees(r.pHUncertainty, finiteDifference(m, (x) => x.pH))
    // A dissolved total under a mass balance does not move with a constant: its ± is 0 (closed form: it is the total).
    expect(r.components.find((c) => c.name === 'Cu^2+')!.dissolvedUncertainty!.sigma).toBeLessThan(1e-12)
  })

  it('gives a solid’s saturation index its ± and names the constant behind most of it', () => {
    const m = model(undersaturated)
    const r = solve(m)
    expect(r.converged).toBe(true)
    const calcite = r.solids.find((s) => s.name === 'CaCO3(s)')!
    expect(calcite.present).toBe(false)
    const fd = finiteDifference(m, si('CaCO3(s)'))
    expectAgrees(calcite.saturationIndexUncertainty, fd)
    // Ksp 3.3e-9 ± 0.5e-9 is 0.066 in log K: the largest term at pH 7.2, far below the pKa of 10.33.
    expect(calcite.saturationIndexUncertainty!.main!.reaction).toBe('CaCO3(s) <=> Ca^2+ + CO3^2-')
    expect(r.pHUncertainty).toBeUndefined()
  })

  it('gives a dissolved total its ± when a solid holds part of it', () => {
    const m = model(undersaturated.replace('component Ca^2+ total 1 mmol/L', 'component Ca^2+ total 5 mmol/L').replace('component H+ pH 7.2', 'component H+ pH 8.5'))
    const r = solve(m)
    expect(r.solids.find((s) => s.name === 'CaCO3(s)')!.present).toBe(true)
    expectAgrees(r.components.find((c) => c.name === 'Ca^2+')!.dissolvedUncertainty, finiteDifference(m, dissolved('Ca^2+')))
    // A solid present at equilibrium stays at SI 0, whatever the constants.
    expect(r.solids.find((s) => s.name === 'CaCO3(s)')!.saturationIndexUncertainty!.sigma).toBeLessThan(1e-9)
  })

  it('adds nothing when no constant carries a ±', () => {
    const r = solve(model(monoprotic.replace(' ± 0.01', '').replace(' ± 0.05', '')))
    expect(r.uncertainty).toBeUndefined()
    expect(r.pHUncertainty).toBeUndefined()
    expect(r.species.some((s) => s.log10Uncertainty !== undefined)).toBe(false)
  })
})

describe('the ± in the command line’s tables', () => {
  it('adds ± columns and says how the ± were found, only when a constant carries one', async () => {
    const { formatResultTable } = await import('../../../cli/tables')
    const m = model(monoprotic)
    const text = formatResultTable(m, solve(m))
    expect(text).toMatch(/^pH \d\.\d{3} ± 0\.05 /m)
    expect(text).toContain("± is one standard uncertainty from the 2 constants with a ±, propagated linearly through the solver's sensitivities.")
    expect(text).toMatch(/^pH ± mostly CH3COOH <=> CH3COO- \+ H\+ \(\d+ % of the variance\)$/m)
    expect(text.split('\n').find((l) => l.startsWith('species'))).toContain('± log10')
    const plain = model(monoprotic.replace(' ± 0.01', '').replace(' ± 0.05', ''))
    expect(formatResultTable(plain, solve(plain))).not.toContain('±')
  })
})
