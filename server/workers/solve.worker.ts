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
import { solve, solveMap, sweep, titration, SOLVER_VERSION, type SolveOptions } from '../solver/index'
import { mapAnswerJson } from '../../shared/results/map-columns'
import { failedTitrationPoints, type AnswerKind, type Result, type SweepResult } from '../../shared/types/result'
import { fitConstants, type FitOutcome } from '../solver/fit'
import type { DataSet } from '../../shared/fit/dataset'
import { ColumnsBuilder, toSweepColumns, type PointParts, type SweepColumns } from '../../shared/results/sweep-columns'
import { binaryParts, PiecedArray, type BinaryArray } from '../../shared/results/binary-answer'

/**
 * How a sweep's answer is written: `points` is the SweepResult JSON (every
 * point with its species objects: stored runs, the command line, older
 * clients); `columns` is the SweepColumns head as JSON with its typed arrays
 * beside it (shared/results/binary-answer.ts), for clients that read it.
 * Other answers are always JSON.
 */
export type AnswerForm = 'points' | 'columns'

export interface SolveTask {
  model: Model
  timeBudgetMs: number
  form?: AnswerForm
}

/** What the worker posts back. */
export interface SolveTaskAnswer {
  kind: AnswerKind
  /**
   * The Result (single), SweepResult (sweep), TitrationResult (titration) or MapAnswer (map) as UTF-8 JSON;
   * for the `columns` form, the SweepColumns head (its arrays as markers) as UTF-8 JSON.
   */
  resultBytes: Uint8Array
  form: AnswerForm
  /** The `columns` form's typed arrays, in the order of the head's markers. */
  resultArrays?: BinaryArray[]
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

/** UTF-8 text written into one growing buffer (sized ahead so it seldom grows: growing holds two buffers at once). */
class ByteWriter {
  bytes: Uint8Array
  length = 0
  constructor(capacity: number) { this.bytes = new Uint8Array(Math.max(4096, Math.ceil(capacity))) }
  write(text: string) {
    for (;;) {
      const { read, written } = encoder.encodeInto(text, this.bytes.subarray(this.length))
      this.length += written
      if (read === text.length) return
      text = text.slice(read)
      this.grow(Math.max(this.bytes.length * 2, this.length + text.length * 3))
    }
  }
  private grow(size: number) {
    const grown = new Uint8Array(size)
    grown.set(this.bytes.subarray(0, this.length))
    this.bytes = grown
  }
  done(): Uint8Array { return this.bytes.subarray(0, this.length) }
}

/** The keys of a sweep answer after `points` (limits), and the closing brace, as JSON.stringify writes them. */
function writeAfterPoints(out: ByteWriter, answer: SweepResult) {
  let after = false
  for (const [key, value] of Object.entries(answer)) {
    if (key === 'points') { after = true; continue }
    if (after && value !== undefined && typeof value !== 'function') out.write(`,${JSON.stringify(key)}:${JSON.stringify(value)}`)
  }
  out.write('}')
}

/** `{"variable":…,"component":…,"values":[…],"points":[` of an answer: what JSON.stringify writes before its first point. */
function beforePoints(answer: Omit<SweepResult, 'points'>): string | null {
  const keys = Object.keys(answer).filter(k => k !== 'points' && answer[k as keyof typeof answer] !== undefined)
  if (keys.slice(0, 3).join() !== 'variable,component,values') return null
  return JSON.stringify({ variable: answer.variable, component: answer.component, values: answer.values, points: [] }).slice(0, -2)
}

/**
 * The bytes of `JSON.stringify(sweep)`, written point by point into one
 * growing buffer: the whole answer never exists as one string beside its
 * bytes, and each point's objects are let go once written (the sweep is
 * consumed). Keys keep their order; a key whose value is undefined is left
 * out, as JSON.stringify does.
 */
export function encodeSweep(answer: SweepResult): Uint8Array {
  const points = answer.points as (Result | undefined)[]
  const perPoint = points.length ? Buffer.byteLength(JSON.stringify(points[0])) + 64 : 0
  const out = new ByteWriter(perPoint * points.length * 1.05 + Buffer.byteLength(JSON.stringify(answer.values)) + 4096)
  out.write('{')
  let first = true
  for (const [key, value] of Object.entries(answer)) {
    if (value === undefined || typeof value === 'function') continue
    out.write(`${first ? '' : ','}${JSON.stringify(key)}:`)
    first = false
    if (key !== 'points') { out.write(JSON.stringify(value)); continue }
    out.write('[')
    for (let i = 0; i < points.length; i++) {
      out.write(i === 0 ? JSON.stringify(points[i] ?? null) : `,${JSON.stringify(points[i] ?? null)}`)
      points[i] = undefined
    }
    out.write(']')
  }
  out.write('}')
  return out.done()
}

/**
 * Solves a sweep and writes each point as it is solved, keeping of it only
 * what the limit windows read: the bytes are those of
 * `JSON.stringify(sweep(model))`, and the sweep never holds all its points'
 * objects at once. A sweep that does not run point by point (no problem can
 * be built, an internal failure) is written whole from its answer.
 */
export function solveSweepToBytes(model: Model, options: SolveOptions): { bytes: Uint8Array, failedPoints: number } {
  const sw = model.sweep!
  const values = Array.isArray(sw.values) ? sw.values : []
  const prefix = beforePoints({ variable: sw.variable ?? 'pH', component: sw.component ?? null, values })!
  let out: ByteWriter | null = null
  const kept: Result[] = []
  const answer = sweep(model, {
    ...options,
    keepPoint: (point) => {
      const text = JSON.stringify(point)
      if (!out) {
        out = new ByteWriter((Buffer.byteLength(text) + 64) * values.length * 1.05 + prefix.length * 2 + 4096)
        out.write(prefix)
        out.write(text)
      } else {
        out.write(`,${text}`)
      }
      const stub = { converged: point.converged, components: point.components } as Result
      kept.push(stub)
      return stub
    },
  })
  const failedPoints = answer.points.filter(p => !p.converged).length
  const streamed = out !== null && answer.points.length === kept.length && answer.points.every((p, i) => p === kept[i]) && beforePoints(answer) === prefix
  if (!streamed) return { bytes: encodeSweep(answer), failedPoints }
  const writer = out as unknown as ByteWriter
  writer.write(']')
  writeAfterPoints(writer, answer)
  return { bytes: writer.done(), failedPoints }
}

/**
 * Solves a sweep into its columns: each point is added to the columns as it
 * is solved and only what the limit windows read is kept of it, so the
 * points' objects die young. A sweep that does not run point by point is
 * converted from its answer.
 */
export function solveSweepToColumns(model: Model, options: SolveOptions): { columns: SweepColumns | (Omit<SweepColumns, 'columns'> & PointParts<PiecedArray>), failedPoints: number } {
  const sw = model.sweep!
  const values = Array.isArray(sw.values) ? sw.values : []
  const builder = new ColumnsBuilder(values.length)
  const kept: Result[] = []
  let streamed = true
  const answer = sweep(model, {
    ...options,
    keepPoint: (point) => {
      if (streamed && kept.length < values.length) builder.add(point)
      else streamed = false
      // What the limit windows read (nothing else when the model has no limits).
      const stub = (model.limits?.length ? { converged: point.converged, components: point.components } : { converged: point.converged }) as Result
      kept.push(stub)
      return stub
    },
  })
  const failedPoints = answer.points.filter(p => !p.converged).length
  streamed &&= answer.points.length === values.length && answer.points.length === kept.length && answer.points.every((p, i) => p === kept[i])
    && answer.variable === (sw.variable ?? 'pH') && answer.component === (sw.component ?? null)
  if (!streamed) return { columns: toSweepColumns(answer), failedPoints }
  const columns: Omit<SweepColumns, 'columns'> & PointParts<PiecedArray> = {
    format: 'sweep-columns', variable: answer.variable, component: answer.component, values: answer.values,
    ...builder.buildInPieces(pieces => new PiecedArray(pieces)),
  }
  if (answer.limits !== undefined) columns.limits = answer.limits
  return { columns, failedPoints }
}

/** Solves the task's model: the answer, its bytes not yet transferred. */
export function solveTask(task: SolveTask): SolveTaskAnswer {
  const started = performance.now()
  const options = { timeBudgetMs: task.timeBudgetMs }
  if (task.model.map) {
    const result = solveMap(task.model, options)
    return {
      kind: 'map',
      form: 'points',
      resultBytes: encoder.encode(mapAnswerJson(result)),
      failedPoints: result.failedCells,
      solverVersion: SOLVER_VERSION,
      elapsedMs: performance.now() - started,
    }
  }
  if (task.model.titration) {
    const result = titration(task.model, options)
    return {
      kind: 'titration',
      form: 'points',
      resultBytes: encoder.encode(JSON.stringify(result)),
      failedPoints: failedTitrationPoints(result),
      solverVersion: SOLVER_VERSION,
      elapsedMs: performance.now() - started,
    }
  }
  if (task.model.sweep && task.form === 'columns') {
    const { columns, failedPoints } = solveSweepToColumns(task.model, options)
    const { head, arrays } = binaryParts(columns)
    return {
      kind: 'sweep',
      form: 'columns',
      resultBytes: encoder.encode(head),
      resultArrays: arrays,
      failedPoints,
      solverVersion: SOLVER_VERSION,
      elapsedMs: performance.now() - started,
    }
  }
  if (task.model.sweep) {
    const { bytes, failedPoints } = solveSweepToBytes(task.model, options)
    return {
      kind: 'sweep',
      form: 'points',
      resultBytes: bytes,
      failedPoints,
      solverVersion: SOLVER_VERSION,
      elapsedMs: performance.now() - started,
    }
  }
  const result = solve(task.model, options)
  return {
    kind: 'single',
    form: 'points',
    resultBytes: encoder.encode(JSON.stringify(result)),
    failedPoints: result.converged ? 0 : 1,
    solverVersion: SOLVER_VERSION,
    elapsedMs: performance.now() - started,
  }
}

/** The pool's entry: the answer with its bytes' buffer in the transfer list. */
export default function runSolveTask(task: SolveTask): SolveTaskAnswer {
  const answer = solveTask(task)
  const buffers = new Set<ArrayBufferLike>([answer.resultBytes.buffer, ...(answer.resultArrays ?? []).map(a => a.buffer)])
  const movable = {
    [Piscina.transferableSymbol]: [...buffers],
    [Piscina.valueSymbol]: answer,
  } as unknown as Parameters<typeof Piscina.move>[0]
  return Piscina.move(movable) as unknown as SolveTaskAnswer
}


/** A fit (server/solver/fit.ts) in the pool: the text, the library texts its compile reaches, the data set. */
export interface FitTask {
  source: string
  /** Every library lookup the text makes, by `name@revision` (revision `latest` when unpinned), as the main thread resolved it. */
  libraries: Record<string, { source: string; revision: number } | null>
  data: DataSet
  weights?: Record<string, number>
  timeBudgetMs: number
}

export function libraryKey(name: string, revision: number | null): string {
  return `${name}@${revision ?? 'latest'}`
}

/** Runs a fit; the answer is the FitOutcome. Named export, called with `{ name: 'runFitTask' }`. */
export function runFitTask(task: FitTask): FitOutcome {
  return fitConstants(task.source, task.data, {
    weights: task.weights,
    deadline: Date.now() + task.timeBudgetMs,
    compileOptions: { resolveLibrary: (name, revision) => task.libraries[libraryKey(name, revision)] ?? null },
  })
}
