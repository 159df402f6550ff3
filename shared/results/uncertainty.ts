/**
 * Words and numbers for the ± of an answer (Result.uncertainty and the
 * `…Uncertainty` fields of shared/types/result.ts), shared by the workbench
 * tables, the printable report, the CSV and the command line.
 */
import type { AnswerUncertainty, Result } from '../types/result'
import { formatFixed, formatPercent, formatScientific } from './typeset'

/** Whether the answer carries ± (some constant of its model has one). */
export function hasUncertainty(result: Result | null | undefined): boolean {
  return result?.uncertainty !== undefined
}

/** `± 0.05` for a log10 quantity (two decimals; two significant digits below 0.01, `± 0` for none); a dash when there is none. */
export function formatLogUncertainty(u: AnswerUncertainty | undefined): string {
  if (!u || !Number.isFinite(u.sigma)) return '—'
  if (u.sigma === 0) return '± 0'
  return `± ${u.sigma < 0.01 ? String(Number(u.sigma.toPrecision(2))) : formatFixed(u.sigma, 2)}`
}

/** `± 1.2e-5` for a concentration, times a unit factor; a dash when there is none or the unit cannot take it. */
export function formatAmountUncertainty(u: AnswerUncertainty | undefined, factor: number | null = 1): string {
  if (!u || factor === null || !Number.isFinite(u.sigma)) return '—'
  return `± ${formatScientific(u.sigma * factor, 2)}`
}

/** The constant behind most of a ±, in words: `mostly CaCO3(s) <=> Ca^2+ + CO3^2- (96 % of the variance)`; null when none. */
export function mainContributorText(u: AnswerUncertainty | undefined): string | null {
  if (!u?.main) return null
  return `mostly ${u.main.reaction} (${formatPercent(u.main.share, 0)} of the variance)`
}

/**
 * What a ± cell says on hover: the constant behind most of it (linear), or
 * the Monte Carlo's band and median (`factor` converts a concentration).
 */
export function uncertaintyDetail(u: AnswerUncertainty | undefined, factor: number | null = 1, amount = false): string | null {
  if (!u) return null
  if (u.low !== undefined && u.high !== undefined && u.median !== undefined) {
    if (factor === null) return null
    const f = (v: number) => (amount ? formatScientific(v * factor, 3) : formatFixed(v, 2))
    return `95 % of the draws: ${f(u.low)} to ${f(u.high)}; median ${f(u.median)}`
  }
  return mainContributorText(u)
}

/** How the ± were found, in one sentence for a table's note. */
export function uncertaintyMethodText(result: Result): string | null {
  const u = result.uncertainty
  if (!u) return null
  const n = u.constants.length
  const constants = `${n} constant${n === 1 ? '' : 's'} with a ±`
  if (u.method === 'linear') return `± is one standard uncertainty from the ${constants}, propagated linearly through the solver's sensitivities.`
  return `± from a Monte Carlo over the ${constants}: ${u.samples ?? 0} draws (seed ${u.seed ?? 0})${u.failed ? `, ${u.failed} left out because their solve did not converge` : ''}; the band is 2.5–97.5 %.`
}
