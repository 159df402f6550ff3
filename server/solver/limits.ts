/**
 * Limit windows along a sweep: for each `limit dissolved X N UNIT` of the
 * model, the ranges of the swept variable where the quantity is at or below
 * the limit. The grid says where a crossing lies (between two converged
 * neighbours, one inside and one outside); its place is then found by
 * bisection on exact solves, never read off the grid, until the bracket is
 * narrower than END_TOLERANCE of the variable (relative for a sweep of a
 * total or a pressure). The reported end is the bracket's inside end, so
 * the whole reported range keeps the limit.
 */
import type { Model, ModelLimit } from '../../shared/poise/model'
import type { LimitWindow, Result, SweepResult } from '../../shared/types/result'
import { limitQuantity } from '../../shared/results/limits'

/** Bracket width at which an end counts as located: 1e-4 of the variable, ten times finer than the 0.001 promised. */
export const END_TOLERANCE = 1e-4
const MAX_BISECTIONS = 80

/** Where a sweep value sits for bisection: log10 for a log sweep, the value itself otherwise. */
function positionOf(model: Model, v: number): number {
  return model.sweep?.log && v > 0 ? Math.log10(v) : v
}
function valueAt(model: Model, position: number): number {
  return model.sweep?.log ? Math.pow(10, position) : position
}
function narrowEnough(model: Model, a: number, b: number): boolean {
  const sw = model.sweep
  const width = Math.abs(b - a)
  // A titration (no sweep): added volumes, relative like a total.
  if (!sw) return width <= END_TOLERANCE * Math.max(Math.abs(a), Math.abs(b))
  if (sw.log || sw.variable === 'pH' || sw.variable === 'temperature') return width <= END_TOLERANCE
  return width <= END_TOLERANCE * Math.max(Math.abs(a), Math.abs(b))
}

/**
 * The end between an outside value and an inside value: bisection on exact
 * solves. Returns the inside end of the final bracket, and whether a solve
 * failed on the way (the end is then the best bracket reached).
 */
function locate(model: Model, limit: ModelLimit, outside: number, inside: number, solveAt: (v: number) => Result): { at: number; failed: boolean } {
  let out = positionOf(model, outside)
  let inn = positionOf(model, inside)
  for (let i = 0; i < MAX_BISECTIONS && !narrowEnough(model, out, inn); i++) {
    const mid = (out + inn) / 2
    const q = limitQuantity(model.components, limit, solveAt(valueAt(model, mid)))
    if (Number.isNaN(q)) return { at: valueAt(model, inn), failed: true }
    if (q <= limit.molPerLitre) inn = mid
    else out = mid
  }
  return { at: valueAt(model, inn), failed: false }
}

export function limitWindows(model: Model, sweep: SweepResult, solveAt: (v: number) => Result): LimitWindow[] {
  return (model.limits ?? []).map((limit) => {
    const window: LimitWindow = { quantity: limit.quantity, value: limit.value, unit: limit.unit, ranges: [] }
    // Converged points only: a failed point is skipped, not taken as inside or outside.
    const known = sweep.values
      .map((v, k) => ({ v, q: limitQuantity(model.components, limit, sweep.points[k]!) }))
      .filter((p) => !Number.isNaN(p.q))
      .map((p) => ({ v: p.v, inside: p.q <= limit.molPerLitre }))
    let failed = false
    let start: number | null = null
    for (let k = 0; k < known.length; k++) {
      const p = known[k]!
      const before = known[k - 1]
      const after = known[k + 1]
      if (p.inside && start === null) {
        if (before) {
          const end = locate(model, limit, before.v, p.v, solveAt)
          failed ||= end.failed
          start = end.at
        } else start = p.v
      }
      if (p.inside && (!after || !after.inside)) {
        let stop = p.v
        if (after) {
          const end = locate(model, limit, after.v, p.v, solveAt)
          failed ||= end.failed
          stop = end.at
        }
        window.ranges.push([Math.min(start!, stop), Math.max(start!, stop)])
        start = null
      }
    }
    window.ranges.sort((a, b) => a[0] - b[0])
    if (failed) window.note = 'A solve near an end of a range did not converge, so that end is located only as closely as the solves that did allowed.'
    return window
  })
}
