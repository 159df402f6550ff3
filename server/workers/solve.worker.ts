/**
 * Worker-thread entry for the solver pool (see server/utils/solver-pool.ts).
 * It receives a compiled model and returns a single Result or a sweep; it is
 * bundled on its own by modules/solver-worker.ts.
 *
 * The answer leaves the worker already serialised: a 3,000-point sweep is
 * tens of megabytes of JSON, and stringifying it (or deserialising a cloned
 * object graph) on the main thread would stall every other request.
 */
import type { Model } from '../../shared/poise/model'
import { solve, sweep, SOLVER_VERSION } from '../solver/index'

export interface SolveTask {
  model: Model
  timeBudgetMs: number
}

export interface SolveTaskOutput {
  kind: 'single' | 'sweep'
  /** The Result (single) or SweepResult (sweep) as JSON text. */
  resultJson: string
  /** Points that did not converge (0 or 1 for a single solve). */
  failedPoints: number
  solverVersion: string
  elapsedMs: number
}

export default function runSolveTask(task: SolveTask): SolveTaskOutput {
  const started = performance.now()
  const options = { timeBudgetMs: task.timeBudgetMs }
  if (task.model.sweep) {
    const result = sweep(task.model, options)
    return {
      kind: 'sweep',
      resultJson: JSON.stringify(result),
      failedPoints: result.points.filter(p => !p.converged).length,
      solverVersion: SOLVER_VERSION,
      elapsedMs: performance.now() - started,
    }
  }
  const result = solve(task.model, options)
  return {
    kind: 'single',
    resultJson: JSON.stringify(result),
    failedPoints: result.converged ? 0 : 1,
    solverVersion: SOLVER_VERSION,
    elapsedMs: performance.now() - started,
  }
}
