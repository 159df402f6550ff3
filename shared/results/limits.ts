/**
 * Limits along a sweep (`limit dissolved X N UNIT`): the quantity a limit
 * caps, read from an answer, and the window stated in words ("dissolved Ni ≤
 * 1 mg/L from pH 9.62 to 11.79"). The solver locates the windows
 * (server/solver/limits.ts); the workbench and the CLI say them with this.
 */
import type { ModelLimit } from '../poise/model'
import type { LimitWindow, Result, SweepResult } from '../types/result'
import { formatFixed, formatScientific, typesetFormula } from './typeset'

/** The capped quantity at an answer, mol/L: Σ weight × dissolved total over the components. NaN when it cannot be read. */
export function limitQuantity(components: { name: string }[], limit: Pick<ModelLimit, 'weights'>, result: Result): number {
  if (!result.converged) return Number.NaN
  let sum = 0
  for (let j = 0; j < components.length; j++) {
    const w = limit.weights[j] ?? 0
    if (w === 0) continue
    const dissolved = result.components.find((c) => c.name === components[j]!.name)?.dissolved
    if (dissolved === undefined) return Number.NaN
    sum += w * dissolved
  }
  return sum
}

/** A value of the swept variable in words and its unit: `pH 9.62`, `25.0 °C`, `total Na⁺ 1.20e-3 mol/L`, `p(CO₂(g)) 1.00e-3 atm`. */
export function sweptValueText(sweep: Pick<SweepResult, 'variable' | 'component'>, value: number): string {
  const name = typesetFormula(sweep.component ?? '')
  switch (sweep.variable) {
    case 'pH':
      return `pH ${formatFixed(value, 2)}`
    case 'temperature':
      return `${formatFixed(value, 1)} °C`
    case 'pressure':
      return `p(${name}) ${formatScientific(value)} atm`
    case 'total':
      return `total ${name} ${formatScientific(value)} mol/L`
    case 'volume':
      return `${Number(value.toPrecision(5))} mL added`
  }
}

/** The bare number of an end, as the sentence writes it after the first (`to 11.79`). */
function endText(sweep: Pick<SweepResult, 'variable'>, value: number): string {
  if (sweep.variable === 'pH') return formatFixed(value, 2)
  if (sweep.variable === 'temperature') return `${formatFixed(value, 1)} °C`
  if (sweep.variable === 'volume') return `${Number(value.toPrecision(5))} mL`
  return `${formatScientific(value)} ${sweep.variable === 'total' ? 'mol/L' : 'atm'}`
}

/** "dissolved Ni ≤ 1 mg/L from pH 9.62 to 11.79", or where it never holds, that it stays above. */
export function limitSentence(sweep: Pick<SweepResult, 'variable' | 'component' | 'values'>, window: LimitWindow): string {
  const head = `${window.quantity} ≤ ${window.value} ${window.unit}`
  if (window.ranges.length === 0) {
    const first = sweep.values[0]
    const last = sweep.values[sweep.values.length - 1]
    const span = first === undefined || last === undefined ? '' : ` (${sweptValueText(sweep, Math.min(first, last))} to ${endText(sweep, Math.max(first, last))})`
    return `${window.quantity} stays above ${window.value} ${window.unit} over the whole sweep${span}`
  }
  const parts = window.ranges.map(([from, to]) =>
    from === to ? `at ${sweptValueText(sweep, from)}` : `from ${sweptValueText(sweep, from)} to ${endText(sweep, to)}`,
  )
  return `${head} ${parts.join(' and ')}`
}
