/**
 * Worker-thread entry for the solver pool (see server/utils/solver-pool.ts).
 * It receives a compiled model and returns a single Result or a sweep; it is
 * bundled on its own by modules/solver-worker.ts.
 *
 * The answer leaves the worker already serialised, as UTF-8 bytes whose
 * buffer is transferred (moved, not copied) to the main thread: a 3,000-point
 * sweep is tens of megabytes of JSON, and stringifying it (or deserialising a
 * cloned object graph, or copying a string) on the main thread would stall
 * every other request. The main thread writes the bytes to the response as
 * they are (see server/utils/raw-json.ts).
 *
 * piscina stays external to the worker bundle (modules/solver-worker.ts):
 * `Piscina.move` must mark the answer with the pool's own symbol.
 */
import Piscina from 'piscina'
import type { Model } from '../../shared/poise/model'
import { solve, sweep, SOLVER_VERSION } from '../solver/index'

export interface SolveTask {
  model: Model
  timeBudgetMs: number
}

/** What the worker posts back. */
export interface SolveTaskAnswer {
  kind: 'single' | 'sweep'
  /** The Result (single) or SweepResult (sweep) as UTF-8 JSON. */
  resultBytes: Uint8Array
  /** Points that did not converge (0 or 1 for a single solve). */
  failedPoints: number
  solverVersion: string
  elapsedMs: number
}

/** As the main thread sees it: the bytes, and the text decoded only when a caller asks (a stored run). */
export interface SolveTaskOutput extends SolveTaskAnswer {
  readonly resultJson: string
}

const encoder = new TextEncoder()

/** Solves the task's model: the answer, its bytes not yet transferred. */
export function solveTask(task: SolveTask): SolveTaskAnswer {
  const started = performance.now()
  const options = { timeBudgetMs: task.timeBudgetMs }
  if (task.model.sweep) {
    const result = sweep(task.model, options)
    return {
      kind: 'sweep',
      // TextEncoder gives the bytes a buffer of their own, safe to transfer (Buffer.from may use a shared pool).
      resultBytes: encoder.encode(JSON.stringify(result)),
      failedPoints: result.points.filter(p => !p.converged).length,
      solverVersion: SOLVER_VERSION,
      elapsedMs: performance.now() - started,
    }
  }
  const result = solve(task.model, options)
  return {
    kind: 'single',
    resultBytes: encoder.encode(JSON.stringify(result)),
    failedPoints: result.converged ? 0 : 1,
    solverVersion: SOLVER_VERSION,
    elapsedMs: performance.now() - started,
  }
}

/** The pool's entry: the answer with its bytes' buffer in the transfer list. */
export default function runSolveTask(task: SolveTask): SolveTaskAnswer {
  const answer = solveTask(task)
  const movable = {
    [Piscina.transferableSymbol]: [answer.resultBytes.buffer],
    [Piscina.valueSymbol]: answer,
  } as unknown as Parameters<typeof Piscina.move>[0]
  return Piscina.move(movable) as unknown as SolveTaskAnswer
}

