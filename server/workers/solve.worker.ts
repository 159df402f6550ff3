/**
 * Worker-thread entry for the solver pool (see server/utils/solver-pool.ts).
 * It receives a compiled model and returns a single Result or a sweep; it is
 * bundled on its own by modules/solver-worker.ts.
 */
import type { Model } from '../../shared/poise/model'
import type { Result, SweepResult } from '../../shared/types/result'
import { solve, sweep, SOLVER_VERSION } from '../solver/index'

export interface SolveTask {
  model: Model
  timeBudgetMs: number
}

export type SolveTaskOutput =
  | { kind: 'single'; result: Result; solverVersion: string; elapsedMs: number }
  | { kind: 'sweep'; result: SweepResult; solverVersion: string; elapsedMs: number }

export default function runSolveTask(task: SolveTask): SolveTaskOutput {
  const started = performance.now()
  const options = { timeBudgetMs: task.timeBudgetMs }
  if (task.model.sweep) {
    const result = sweep(task.model, options)
    return { kind: 'sweep', result, solverVersion: SOLVER_VERSION, elapsedMs: performance.now() - started }
  }
  const result = solve(task.model, options)
  return { kind: 'single', result, solverVersion: SOLVER_VERSION, elapsedMs: performance.now() - started }
}
