/**
 * What the H+ line of the totals means. The proton total T(H) counts H+ over
 * the components (water's OH⁻ as −1 H), so a negative total is a proton
 * deficit: the solution holds that much strong base (e.g. NaOH) beyond the
 * acid and base the other components bring. With the pH held (a `pH`
 * component or a pH sweep) T(H) is what holding that pH takes.
 */
import { formatScientific } from './typeset'
import { fromMolar, isMassUnit, type OutputUnit } from './units'

/** The component that carries the proton balance. */
export const PROTON = 'H+'

/** For a negative proton total, the strong base it equals, mol/L (as OH⁻); null for zero or positive totals and other components. */
export function strongBaseEquivalent(component: { name: string; total: number }): number | null {
  return component.name === PROTON && Number.isFinite(component.total) && component.total < 0 ? -component.total : null
}

/** "equivalent to 2.50e-3 mmol/L of strong base", in the shown unit when it is a molar one, else in mmol/L. */
export function strongBaseSentence(molPerLitre: number, unit: OutputUnit): string {
  const molar: OutputUnit = isMassUnit(unit) ? 'mmol/L' : unit
  return `equivalent to ${formatScientific(fromMolar(molPerLitre, molar, null)!)} ${molar} of strong base`
}

/**
 * What the pH-holding line of the totals says: for a pH sweep, that each
 * point holds the pH at its value and the other totals as written; for a
 * held pH, that the H+ total is what holding it takes.
 */
export function heldPhSentence(sweepOverPh: boolean): string {
  return sweepOverPh
    ? 'A pH sweep holds the pH at each point’s value and every other total as written; the H+ total is the acid (positive) or strong base (negative) it takes to hold that pH.'
    : 'The pH is held: the H+ total is the acid (positive) or strong base (negative) it takes to hold that pH.'
}
