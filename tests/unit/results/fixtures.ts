/**
 * Demo fixtures for the results modules: small systems whose Results are
 * built here from mass action (c_i = β_i Π a_j^ν_ij, ideal solution) so that
 * every mass balance closes exactly. The constants are round demo values
 * near the usual handbook ones, recalled from memory; these fixtures exercise
 * the display and mapping code, they are not checks of chemistry.
 */

import type { Result, SweepResult } from '../../../shared/types/result'
import type { StoichiometryModel } from '../../../shared/results/share'

export interface FixtureSpecies {
  name: string
  charge: number
  nu: number[]
  logK: number
}

export interface FixtureSystem {
  components: { name: string; mode: 'total' | 'pH' | 'free' }[]
  species: FixtureSpecies[]
}

export function stoichiometry(system: FixtureSystem): StoichiometryModel {
  return { components: system.components, species: system.species.map(({ name, nu }) => ({ name, nu })) }
}

/** A converged Result from the free log10 activities of the components. */
export function solvedAt(system: FixtureSystem, logFree: number[]): Result {
  const species = system.species.map((s) => {
    const log10 = s.logK + s.nu.reduce((sum, n, j) => sum + n * logFree[j], 0)
    const concentration = 10 ** log10
    return { name: s.name, charge: s.charge, concentration, log10, activity: concentration, gamma: 1 }
  })
  const ionicStrength = species.reduce((sum, s) => sum + 0.5 * s.charge ** 2 * s.concentration, 0)
  const components = system.components.map((c, j) => {
    const total = system.species.reduce((sum, s, i) => sum + s.nu[j] * species[i].concentration, 0)
    return { name: c.name, mode: c.mode, total, free: 10 ** logFree[j], dissolved: total }
  })
  const h = system.components.findIndex((c) => c.name === 'H+')
  return {
    converged: true,
    iterations: 7,
    temperatureC: 25,
    pH: h >= 0 ? -logFree[h] : Number.NaN,
    ionicStrength,
    species,
    solids: [],
    components,
    residuals: { maxScaled: 2e-13 },
  }
}

export function failedPoint(reason: string): Result {
  return {
    converged: false,
    iterations: 200,
    temperatureC: 25,
    pH: Number.NaN,
    ionicStrength: Number.NaN,
    species: [],
    solids: [],
    components: [],
    residuals: { maxScaled: 0.3 },
    reason,
  }
}

/**
 * Carbonate at fixed pH: components H+ and CO3^2-. Formation constants from
 * the acid constants pKa1 6.35, pKa2 10.33 (25 °C, I = 0, from memory).
 */
export const PKA1_CARBONATE = 6.35
export const PKA2_CARBONATE = 10.33
export const carbonate: FixtureSystem = {
  components: [
    { name: 'H+', mode: 'pH' },
    { name: 'CO3^2-', mode: 'total' },
  ],
  species: [
    { name: 'H+', charge: 1, nu: [1, 0], logK: 0 },
    { name: 'OH-', charge: -1, nu: [-1, 0], logK: -14 },
    { name: 'CO3^2-', charge: -2, nu: [0, 1], logK: 0 },
    { name: 'HCO3-', charge: -1, nu: [1, 1], logK: PKA2_CARBONATE },
    { name: 'H2CO3', charge: 0, nu: [2, 1], logK: PKA2_CARBONATE + PKA1_CARBONATE },
  ],
}

/** Free carbonate that gives a dissolved total of `total` at `pH` (closed form). */
export function carbonateAt(pH: number, total: number): Result {
  const h = 10 ** -pH
  const k1 = 10 ** -PKA1_CARBONATE
  const k2 = 10 ** -PKA2_CARBONATE
  const alpha2 = (k1 * k2) / (h * h + k1 * h + k1 * k2)
  return solvedAt(carbonate, [-pH, Math.log10(alpha2 * total)])
}

/** A pH sweep of 2 mmol/L carbonate from 4 to 12; the point at pH 9 failed (on purpose). */
export function carbonateSweep(): SweepResult {
  const values = Array.from({ length: 17 }, (_, k) => 4 + k * 0.5)
  return {
    variable: 'pH',
    component: null,
    values,
    points: values.map((pH) => (pH === 9 ? failedPoint('mass balance of CO3^2- did not close') : carbonateAt(pH, 2e-3))),
  }
}

/**
 * Copper in ammonia (a rinse-tank scenario): components H+, Cu^2+, NH3 with
 * demo stepwise-ish constants; Cu(NH3)4^2+ holds four NH3, so shares of NH3
 * depend on the coefficient, not only on concentration.
 */
export const copperAmmonia: FixtureSystem = {
  components: [
    { name: 'H+', mode: 'pH' },
    { name: 'Cu^2+', mode: 'total' },
    { name: 'NH3', mode: 'total' },
  ],
  species: [
    { name: 'H+', charge: 1, nu: [1, 0, 0], logK: 0 },
    { name: 'OH-', charge: -1, nu: [-1, 0, 0], logK: -14 },
    { name: 'Cu^2+', charge: 2, nu: [0, 1, 0], logK: 0 },
    { name: 'NH3', charge: 0, nu: [0, 0, 1], logK: 0 },
    { name: 'NH4+', charge: 1, nu: [1, 0, 1], logK: 9.24 },
    { name: 'CuNH3^2+', charge: 2, nu: [0, 1, 1], logK: 4.0 },
    { name: 'Cu(NH3)4^2+', charge: 2, nu: [0, 1, 4], logK: 12.6 },
    { name: 'CuOH+', charge: 1, nu: [-1, 1, 0], logK: -7.9 },
  ],
}

/** Copper ammonia at pH 9.5, free Cu^2+ 1e-12 and free NH3 0.05 mol/L (about 25 µmol/L copper in all). */
export function copperAmmoniaResult(): Result {
  return solvedAt(copperAmmonia, [-9.5, -12, Math.log10(0.05)])
}

/**
 * Sulfide: components H+ and HS-; H2S from pKa1 7.0 and S^2- from a demo
 * pKa2 of 13.9 (both from memory; the second is uncertain in the literature).
 */
export const sulfide: FixtureSystem = {
  components: [
    { name: 'H+', mode: 'pH' },
    { name: 'HS-', mode: 'total' },
  ],
  species: [
    { name: 'H+', charge: 1, nu: [1, 0], logK: 0 },
    { name: 'OH-', charge: -1, nu: [-1, 0], logK: -14 },
    { name: 'HS-', charge: -1, nu: [0, 1], logK: 0 },
    { name: 'H2S', charge: 0, nu: [1, 1], logK: 7.0 },
    { name: 'S^2-', charge: -2, nu: [-1, 1], logK: -13.9 },
  ],
}

/** Sulfide (1 mmol/L free HS-) at the given pH. */
export function sulfideAt(pH: number): Result {
  return solvedAt(sulfide, [-pH, -3])
}
