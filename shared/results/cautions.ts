/**
 * Cautions shown with results. A model that puts most of a sulfide, cyanide
 * or ammonia component into its volatile neutral form is telling the reader
 * that a toxic gas can leave the solution; the product says so plainly and
 * defers to measurement, regulations and licensed practice. The footer on
 * model limits goes with every result.
 */

import type { Result, SweepResult } from '../types/result'
import type { StoichiometryModel } from './share'
import { speciesShares } from './share'
import { formatPercent, typesetFormula } from './typeset'

export type ToxicGas = 'hydrogen sulfide' | 'hydrogen cyanide' | 'ammonia'

interface VolatileSpecies {
  formula: string
  gas: ToxicGas
  /** What chemists call the component it belongs to. */
  family: string
  /** When does more of it form: the advice differs for acid- and base-released gases. */
  releasedBy: 'acid' | 'base'
}

const VOLATILE_SPECIES: VolatileSpecies[] = [
  { formula: 'H2S', gas: 'hydrogen sulfide', family: 'sulfide', releasedBy: 'acid' },
  { formula: 'HCN', gas: 'hydrogen cyanide', family: 'cyanide', releasedBy: 'acid' },
  { formula: 'NH3', gas: 'ammonia', family: 'ammonia', releasedBy: 'base' },
]

/** Share of its component above which the warning shows (common practice is to warn early, not late). */
export const TOXIC_SHARE_THRESHOLD = 0.1

export interface ToxicCaution {
  species: string
  component: string
  gas: ToxicGas
  /** Largest share found (over the points of a sweep). */
  share: number
  /** Swept value where the share is largest; null for a single result. */
  at: number | null
  message: string
}

function volatileOf(name: string): VolatileSpecies | undefined {
  const bare = name.replace(/\(aq\)$/, '')
  return VOLATILE_SPECIES.find((v) => v.formula === bare)
}

/**
 * The component whose share a volatile species is measured against: the one
 * it holds other than H+ (H2S against S^2- or HS-, NH3 against NH3 itself).
 */
function parentComponent(model: StoichiometryModel, species: string): string | null {
  const s = model.species.find((x) => x.name === species)
  if (!s) return null
  const j = model.components.findIndex((c, k) => c.name !== 'H+' && (s.nu[k] ?? 0) > 0)
  return j < 0 ? null : model.components[j].name
}

function cautionMessage(v: VolatileSpecies, species: string, component: string, share: number, where: string): string {
  const name = typesetFormula(species)
  const lead = `${name} is ${formatPercent(share, 0)} of the dissolved ${v.family} (${typesetFormula(component)})${where}.`
  const risk =
    v.releasedBy === 'acid'
      ? `${capitalise(v.gas)} is a toxic gas that can escape from this solution, and more of it forms if the solution is made more acidic.`
      : `Ammonia gas is toxic and escapes more readily as the solution becomes more alkaline or warmer.`
  return `${lead} ${risk} Work with ventilation, and base safety decisions on accredited measurement, local regulations and licensed practice rather than on this model.`
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1)
}

/** Volatile species in one result whose share of their component exceeds the threshold. */
export function toxicCautions(
  result: Result,
  model: StoichiometryModel,
  threshold = TOXIC_SHARE_THRESHOLD,
): ToxicCaution[] {
  if (!result.converged) return []
  return candidates(result, model).flatMap(({ v, index, species, component }) => {
    const share = speciesShares(result, model, component)[index]
    if (!(share > threshold)) return []
    return [{ species, component, gas: v.gas, share, at: null, message: cautionMessage(v, species, component, share, '') }]
  })
}

/** As `toxicCautions`, over the points of a sweep: one caution a species, at its largest share. */
export function sweepToxicCautions(
  sweep: SweepResult,
  model: StoichiometryModel,
  threshold = TOXIC_SHARE_THRESHOLD,
  formatX: (x: number) => string = String,
): ToxicCaution[] {
  const worst = new Map<string, { v: VolatileSpecies; component: string; share: number; at: number }>()
  sweep.points.forEach((point, k) => {
    if (!point.converged) return
    for (const { v, index, species, component } of candidates(point, model)) {
      const share = speciesShares(point, model, component)[index]
      const before = worst.get(species)
      if (share > threshold && (!before || share > before.share)) {
        worst.set(species, { v, component, share, at: sweep.values[k] })
      }
    }
  })
  return [...worst].map(([species, { v, component, share, at }]) => ({
    species,
    component,
    gas: v.gas,
    share,
    at,
    message: cautionMessage(v, species, component, share, ` at ${sweepPlace(sweep)} ${formatX(at)}`),
  }))
}

function sweepPlace(sweep: SweepResult): string {
  switch (sweep.variable) {
    case 'pH':
      return 'pH'
    case 'total':
      return `total ${typesetFormula(sweep.component ?? '')} (mol/L) =`
    case 'temperature':
      return 'temperature (°C) ='
    case 'pressure':
      return `pressure of ${typesetFormula(sweep.component ?? '')} (atm) =`
    case 'volume':
      return 'added titrant (mL) ='
  }
}

function candidates(result: Result, model: StoichiometryModel) {
  return result.species.flatMap((s, index) => {
    const v = volatileOf(s.name)
    const component = v ? parentComponent(model, s.name) : null
    return v && component ? [{ v, index, species: s.name, component }] : []
  })
}

/**
 * Sulfide and cyanide are dangerous on acidification even where the model
 * puts little of them in the volatile form (an alkaline cyanide bath), so a
 * system that can form H2S or HCN gets a standing note. `warned` lists the
 * species that already carry a warning, which says more.
 */
export function acidificationNotes(model: StoichiometryModel, warned: string[] = []): string[] {
  return model.species.flatMap((s) => {
    const v = volatileOf(s.name)
    if (!v || v.releasedBy !== 'acid' || warned.includes(s.name)) return []
    return [
      `This system contains ${v.family}: acidifying it converts ${v.family} into ${v.gas} (${typesetFormula(s.name)}), ` +
        'a toxic gas. Keep acids away from it unless the work is planned for that, with ventilation and monitoring.',
    ]
  })
}

const ACTIVITY_WORDS: Record<string, string> = {
  ideal: 'no activity correction (ideal solution), which suits only dilute solutions',
  davies: 'the Davies equation, commonly taken as reasonable up to an ionic strength of about 0.5 mol/L',
  'debye-huckel': 'the extended Debye–Hückel equation, commonly taken as reasonable up to an ionic strength of about 0.1 mol/L',
}

/**
 * The footer on model limits, in our own words. With the activity model
 * named it says which correction was used and roughly where it holds
 * (ranges are common practice, not a single source).
 */
export function modelLimitsText(activity?: string | null): string {
  const correction = activity && ACTIVITY_WORDS[activity] ? ` Activities here use ${ACTIVITY_WORDS[activity]}.` : ''
  return (
    'These numbers come from a model. They are only as good as the constants and the activity model behind them, ' +
    'and they assume the solution has reached equilibrium — slow reactions, species the file leaves out and conditions ' +
    `outside the constants' range are not captured.${correction} Check important values by measurement; decisions about ` +
    'effluent, drinking water or safety follow local regulations, accredited measurement and licensed practice, not a model.'
  )
}
