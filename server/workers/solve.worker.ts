/**
 * Worker-thread entry for the solver pool (see server/utils/solver-pool.ts).
 * It receives a compiled model and returns a single Result, a sweep or a
 * titration; it is
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
import { solve, sweep, titration, SOLVER_VERSION } from '../solver/index'
import { failedTitrationPoints, type AnswerKind, type Result, type SweepResult } from '../../shared/types/result'

export interface SolveTask {
  model: Model
  timeBudgetMs: number
}

/** What the worker posts back. */
export interface SolveTaskAnswer {
  kind: AnswerKind
  /** The Result (single), SweepResult (sweep) or TitrationResult (titration) as UTF-8 JSON. */
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

// TextEncoder gives the bytes a buffer of their own, safe to transfer (Buffer.from may use a shared pool).
const encoder = new TextEncoder()

/**
 * The bytes of `JSON.stringify(sweep)`, written point by point into one
 * growing buffer: the whole answer never exists as one string beside its
 * bytes, and each point's objects are let go once written (the sweep is
 * consumed). Keys keep their order; a key whose value is undefined is left
 * out, as JSON.stringify does.
 */
export function encodeSweep(answer: SweepResult): Uint8Array {
  const points = answer.points as (Result | undefined)[]
  // Sized from the first point (points of one sweep are alike), so it seldom grows: growing holds two buffers at once.
  const perPoint = points.length ? Buffer.byteLength(JSON.stringify(points[0])) + 64 : 0
  let bytes = new Uint8Array(Math.max(4096, Math.ceil(perPoint * points.length * 1.05) + Buffer.byteLength(JSON.stringify(answer.values)) + 4096))
  let length = 0
  const write = (text: string) => {
    for (;;) {
      const { read, written } = encoder.encodeInto(text, bytes.subarray(length))
      length += written
      if (read === text.length) return
      text = text.slice(read)
      const grown = new Uint8Array(Math.max(bytes.length * 2, length + text.length * 3))
      grown.set(bytes.subarray(0, length))
      bytes = grown
    }
  }
  write('{')
  let first = true
  for (const [key, value] of Object.entries(answer)) {
    if (value === undefined || typeof value === 'function') continue
    write(`${first ? '' : ','}${JSON.stringify(key)}:`)
    first = false
    if (key !== 'points') { write(JSON.stringify(value)); continue }
    write('[')
    for (let i = 0; i < points.length; i++) {
      write(i === 0 ? JSON.stringify(points[i] ?? null) : `,${JSON.stringify(points[i] ?? null)}`)
      points[i] = undefined
    }
    write(']')
  }
  write('}')
  return bytes.subarray(0, length)
}

/** Solves the task's model: the answer, its bytes not yet transferred. */
export function solveTask(task: SolveTask): SolveTaskAnswer {
  const started = performance.now()
  const options = { timeBudgetMs: task.timeBudgetMs }
  if (task.model.titration) {
    const result = titration(task.model, options)
    return {
      kind: 'titration',
      resultBytes: encoder.encode(JSON.stringify(result)),
      failedPoints: failedTitrationPoints(result),
      solverVersion: SOLVER_VERSION,
      elapsedMs: performance.now() - started,
    }
  }
  if (task.model.sweep) {
    const result = sweep(task.model, options)
    const failedPoints = result.points.filter(p => !p.converged).length
    return {
      kind: 'sweep',
      resultBytes: encodeSweep(result),
      failedPoints,
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

