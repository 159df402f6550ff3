/**
 * Limits on what one request may ask the solver for. They keep one user's
 * huge sweep from occupying the pool or the study queue; the messages say
 * what to change. Plain TypeScript (no Nitro): the workers read it too.
 */
import type { Model } from '../../shared/poise/model'
import { SIZE_LIMITS } from '../../shared/poise/limits'

export const SOLVE_LIMITS = {
  /** The language's own size limits, this very object: a compiled model keeps to them; a stored or hand-made one is checked again. */
  size: SIZE_LIMITS,
  /** Wall-clock budget of one run (a whole sweep) inside the worker. */
  timeBudgetMs: 20_000,
  /** Wall-clock budget of one fit (every step a solve of the whole data set) inside the worker; past it the fit stops unconverged. */
  fitTimeBudgetMs: 60_000,
  /** Extra time before the pool aborts a worker that ignores its budget. */
  graceMs: 5_000,
  maxQueuedTasks: 32,
  /** Stored runs are jobs on the study queue (server/jobs/): at most this many queued or running per account (429 beyond). */
  jobsPerUser: 3,
  /** The Retry-After of that 429, in seconds: about a small job's time. */
  jobsRetryAfterSeconds: 10,
  /** Points one job may have (sweep points, map cells, titration volumes); more is refused with 422. */
  maxJobPoints: 20_000,
  /**
   * A worker computes a long job for at most this long at a time, then lets
   * a waiting job in before it goes on: one account's long study delays
   * another's small run by at most one slice.
   */
  jobSliceMs: 1000,
  /** A long divisible study (a sweep, a map) is queued as ranges of about this many points, which several workers compute at once. */
  jobSegmentPoints: 1000,
} as const

/** A message saying which limit the model exceeds, or null when it fits. */
export function modelLimitProblem(model: Model): string | null {
  const points = model.sweep?.values.length ?? 0
  if (points > SOLVE_LIMITS.size.maxSweepPoints) {
    return `The sweep has ${points} points; at most ${SOLVE_LIMITS.size.maxSweepPoints} are allowed. Use a larger step or fewer points.`
  }
  if (model.map) {
    const nx = model.map.x?.values?.length ?? 0
    const ny = model.map.y?.values?.length ?? 0
    if (nx > SOLVE_LIMITS.size.maxSweepPoints || ny > SOLVE_LIMITS.size.maxSweepPoints || nx * ny > SOLVE_LIMITS.size.maxMapCells) {
      return `The map has ${nx} × ${ny} = ${nx * ny} cells; at most ${SOLVE_LIMITS.size.maxMapCells} are allowed, and ${SOLVE_LIMITS.size.maxSweepPoints} points on an axis. Use fewer points on an axis.`
    }
  }
  const titrationPoints = model.titration?.values?.length ?? 0
  if (titrationPoints > SOLVE_LIMITS.size.maxSweepPoints) {
    return `The titration has ${titrationPoints} points; at most ${SOLVE_LIMITS.size.maxSweepPoints} are allowed. Use a larger step or fewer points.`
  }
  if (model.species.length > SOLVE_LIMITS.size.maxSpecies) {
    return `The system has ${model.species.length} species; at most ${SOLVE_LIMITS.size.maxSpecies} are allowed. Split it into smaller systems.`
  }
  if (model.solids.length > SOLVE_LIMITS.size.maxSolids) {
    return `The system has ${model.solids.length} solids; at most ${SOLVE_LIMITS.size.maxSolids} are allowed.`
  }
  return null
}
