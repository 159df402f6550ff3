/**
 * How a component's dissolved amount is divided among the species: the share
 * of species i in component j is ν_ij c_i / Σ_k ν_kj c_k. The species table,
 * the distribution diagram and the cautions all read shares from here.
 *
 * The denominator is the dissolved total (aqueous species only), so the
 * shares of a component add up to one even when a solid holds part of it;
 * the precipitated amount is shown with the solids.
 */

import type { Result } from '../types/result'

/** The part of the compiled model that shares need (a whole `Model` fits). */
export interface StoichiometryModel {
  components: { name: string }[]
  /** `nu` is over `components`, in the same order. */
  species: { name: string; nu: number[] }[]
}

/**
 * Components whose species can be shared out: every species holds zero or
 * more of it. H+ is not one (OH- holds −1 of it), so a fraction of "total
 * H+" would mean nothing.
 */
export function distributableComponents(model: StoichiometryModel): string[] {
  return model.components
    .filter((_, j) => model.species.some((s) => s.nu[j] > 0) && model.species.every((s) => s.nu[j] >= 0))
    .map((c) => c.name)
}

/** Stoichiometric coefficient of each result species in component j, by name (0 when unknown). */
function coefficientsByName(model: StoichiometryModel, j: number): Map<string, number> {
  return new Map(model.species.map((s) => [s.name, s.nu[j] ?? 0]))
}

/** Σ ν_ij c_i over the aqueous species of a result, mol/L; NaN for an unknown component. */
export function dissolvedTotal(result: Result, model: StoichiometryModel, component: string): number {
  const j = model.components.findIndex((c) => c.name === component)
  if (j < 0) return Number.NaN
  const nu = coefficientsByName(model, j)
  let total = 0
  for (const s of result.species) total += (nu.get(s.name) ?? 0) * s.concentration
  return total
}

/**
 * The share of each species of `result` in the dissolved total of
 * `component`, in the order of `result.species`. Species without the
 * component get 0; every share is NaN when the component is unknown or has
 * nothing dissolved.
 */
export function speciesShares(result: Result, model: StoichiometryModel, component: string): number[] {
  const j = model.components.findIndex((c) => c.name === component)
  if (j < 0) return result.species.map(() => Number.NaN)
  const nu = coefficientsByName(model, j)
  const parts = result.species.map((s) => (nu.get(s.name) ?? 0) * s.concentration)
  const total = parts.reduce((sum, part) => sum + part, 0)
  if (!(total > 0)) return result.species.map(() => Number.NaN)
  return parts.map((part) => part / total)
}
