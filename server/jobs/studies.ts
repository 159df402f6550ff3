/**
 * How each study kind (kinds.ts) is computed: in slices, and how its points
 * become the stored answer. A worker (server/jobs/worker.ts) runs these in
 * its solver thread (server/jobs/thread.ts); nothing here touches the
 * database, Redis or Nitro.
 *
 * To add a kind (a map, a fit, a Monte Carlo run): describe it in kinds.ts
 * (which models, how many points) and put its `StudyRunner` in
 * `STUDY_RUNNERS` here under the same name. See DEVELOPERS.md, "Study jobs".
 */
import type { Model } from '../../shared/poise/model'
import { failedTitrationPoints, type MapAnswer, type MapAxis, type Result, type SweepResult, type TitrationResult } from '../../shared/types/result'
import type { ModelSweep } from '../../shared/poise/model'
import { bareSweepPoints, solve, solveAtSweepValue, solveMap, sweep, titration, unsolvable, type SolveOptions } from '../solver/index'
import { bareCurve } from '../solver/titration'
import { bandsFromDraws, drawnModel, drawSample, drawShifts, type DrawSample } from '../solver/montecarlo'
import { CANCELLED_CELL_REASON } from '../solver/map'
import { ColumnsBuilder, failedPoints, joinColumns, pointTexts, sweepView, type PointParts } from '../../shared/results/sweep-columns'
import { mapAnswerJson } from '../../shared/results/map-columns'
import { limitWindows } from '../solver/limits'
import { STUDY_SHAPES } from './kinds'

/** What a runner is told while it computes a slice. */
export interface SliceContext {
  /** Say how many points of this slice are done so far (cheap; call after each point). */
  progress(doneInSlice: number): void
  /** True when the slice must end now (the user cancelled, or the slice's time is up): return the points done. Check between points. */
  shouldStop(): boolean
  /** The solver's options for this slice (its time guard). */
  solveOptions: SolveOptions
}

/** Points computed by one slice, in order. */
export interface Slice {
  /** How many of the study's points this slice covers. */
  count: number
  /** A divisible kind's points, by columns (stored in the binary form, server/jobs/store.ts). */
  columns?: PointParts
  /** A kind that is not divisible: its whole answer as JSON. */
  answer?: string
  /** Points among them that did not converge. */
  failed: number
}

/**
 * A slice as stored and read back: its columns, or its answer's JSON text
 * (`text`; in parts stored by an older worker, one point's JSON a line).
 */
export type StoredPart = { count: number, columns: PointParts<ArrayLike<number>> | PointParts } | { count: number, text: string }

/** The columns of stored parts, joined in order (a part from an older worker, as JSON lines, is read point by point). */
export function joinParts(parts: StoredPart[]): PointParts {
  return joinColumns(parts.map((part) => {
    if ('columns' in part) return { columns: part.columns, from: 0, to: part.count }
    const builder = new ColumnsBuilder()
    for (const line of part.text.split('\n')) builder.add(JSON.parse(line) as Result)
    return { columns: builder.build(), from: 0, to: builder.length }
  }))
}

/** The stored answer of a job as JSON; null when nothing was computed (a job cancelled before its first point). */
export type StudyAnswer = string | null

export interface StudyRunner {
  /**
   * Computes points from `from` on, in order, until `to` (exclusive) or
   * `ctx.shouldStop()`; a later slice goes on from where this one ended. For
   * a divisible kind (kinds.ts) `from` may be any range start: the points
   * before it may not be computed yet. A kind that cannot stop part-way
   * computes everything at once (count = its points, one item: the answer).
   */
  run(model: Model, from: number, to: number, ctx: SliceContext): Slice
  /**
   * The stored answer from the points computed, in order (the stored
   * slices from the first point on, without a gap); `complete` is false for
   * a cancelled job, whose answer keeps those points. (Failed points are
   * counted from the slices.)
   */
  finish(model: Model, parts: StoredPart[], complete: boolean, solveOptions: SolveOptions): StudyAnswer
  /**
   * Points of the stored answer that did not converge, for a kind whose
   * slices are not the answer's points (a Monte Carlo run's are draws);
   * without it the slices' `failed` are counted.
   */
  failedOf?(model: Model, resultJson: string): number
}

/** A kind answered by one computation that cannot stop part-way (a single solve, a titration). */
function whole(kind: string, compute: (model: Model, options: SolveOptions) => { json: string, failed: number }): StudyRunner {
  const points = STUDY_SHAPES.find((shape) => shape.kind === kind)!.points
  return {
    run(model, _from, _to, ctx) {
      const { json, failed } = compute(model, ctx.solveOptions)
      ctx.progress(points(model))
      return { count: points(model), answer: json, failed }
    },
    finish(_model, parts) {
      const part = parts[0]
      return part && 'text' in part ? part.text : null
    },
  }
}

/** Points re-solved before a slice's first point so its continuation predicts as one long sweep would. */
const SWEEP_LEAD = 2

class StopSlice extends Error {}

export const sweepRunner: StudyRunner = {
  run(model, from, to, ctx) {
    const values = model.sweep!.values.slice(0, to)
    const lead = Math.min(from, SWEEP_LEAD)
    const slice: Slice = { count: 0, failed: 0 }
    const columns = new ColumnsBuilder()
    let seen = 0
    // Limit windows are located once, over the whole sweep, in finish().
    const part: Model = { ...model, limits: undefined, sweep: { ...model.sweep!, values: values.slice(from - lead) } }
    sweep(part, {
      ...ctx.solveOptions,
      keepPoint: (point) => {
        seen++
        if (seen > lead) {
          columns.add(point)
          slice.count++
          if (!point.converged) slice.failed++
          ctx.progress(slice.count)
          if (from + slice.count < values.length && ctx.shouldStop()) throw new StopSlice()
        }
        return { converged: point.converged, components: point.components } as typeof point
      },
    })
    // A sweep that could not run point by point (no problem could be built) answers every point at once, unsolved.
    if (slice.count === 0 && from < values.length) {
      const whole = sweep(part, ctx.solveOptions)
      for (const point of whole.points.slice(lead)) {
        columns.add(point)
        slice.count++
        if (!point.converged) slice.failed++
      }
    }
    slice.columns = columns.build()
    return slice
  },
  finish(model, parts, _complete, solveOptions) {
    const points = joinParts(parts)
    const n = points.templateOf.length
    if (!n) return null
    const sw = model.sweep!
    const values = sw.values.slice(0, n)
    const head = JSON.stringify({ variable: sw.variable, component: sw.component ?? null, values }).slice(0, -1)
    const items = pointTexts(points)
    let limits = ''
    if (model.limits?.length) {
      const done: SweepResult = sweepView({ format: 'sweep-columns', variable: sw.variable, component: sw.component ?? null, values, ...points })
      const cut: Model = { ...model, sweep: { ...sw, values } }
      limits = `,"limits":${JSON.stringify(limitWindows(cut, done, (v) => solveAtSweepValue(cut, v, solveOptions)))}`
    }
    return `${head},"points":[${items.join(',')}]${limits}}`
  },
}

export const titrationRunner = whole('titration', (model, options) => {
  const result: TitrationResult = titration(model, options)
  return { json: JSON.stringify(result), failed: failedTitrationPoints(result) }
})

export const singleRunner = whole('single', (model, options) => {
  const result = solve(model, options)
  return { json: JSON.stringify(result), failed: result.converged ? 0 : 1 }
})

const axisOf = (sw: ModelSweep): MapAxis => ({ variable: sw.variable, component: sw.component, values: sw.values, log: sw.log })

/**
 * A map, row by row: a range is whole rows (kinds.ts aligns it), solved by
 * `solveMap` over those rows after the row above them (re-solved, so each
 * cell starts from the cell above as in one map); a slice stops at the end
 * of a row. A slice's cells are stored by columns (cut from the solver's
 * own); `finish` joins the slices' columns into the map's.
 */
export const mapRunner: StudyRunner = {
  run(model, from, to, ctx) {
    const map = model.map!
    const nx = map.x.values.length
    const row0 = Math.floor(from / nx)
    const lead = row0 > 0 ? 1 : 0
    const part: Model = { ...model, map: { ...map, y: { ...map.y, values: map.y.values.slice(row0 - lead, Math.ceil(to / nx)) } } }
    const skip = lead * nx
    let asked = 0
    const answer = solveMap(part, {
      ...ctx.solveOptions,
      onProgress: (done) => ctx.progress(Math.max(0, done - skip)),
      // Asked before each cell: stop only between rows, after this range's first.
      cancelled: () => {
        const cell = asked++
        return cell > skip && cell % nx === 0 && ctx.shouldStop()
      },
    })
    const done = answer.cancelled ? answer.cellsDone : answer.y.values.length * nx
    // This range's cells, cut from the columns (the row above left out) without making their Results.
    const columns = joinColumns([{ columns: answer.cells, from: skip, to: Math.max(skip, done) }])
    return { count: columns.templateOf.length, columns, failed: failedPoints(columns) }
  },
  finish(model, parts, complete) {
    const solved = parts.reduce((sum, part) => sum + part.count, 0)
    if (!solved) return null
    const map = model.map!
    const total = map.x.values.length * map.y.values.length
    const ranges = [{ columns: joinParts(parts), from: 0, to: solved }]
    if (solved < total) {
      const notReached = new ColumnsBuilder()
      const cell = unsolvable(model, CANCELLED_CELL_REASON)
      for (let k = solved; k < total; k++) notReached.add(cell)
      ranges.push({ columns: notReached.build(), from: 0, to: total - solved })
    }
    const cells = ranges.length === 1 ? ranges[0]!.columns : joinColumns(ranges)
    const answer: MapAnswer = {
      format: 'map-columns', x: axisOf(map.x), y: axisOf(map.y), cells,
      cellsDone: complete ? total : solved, failedCells: failedPoints(cells), cancelled: !complete,
    }
    return mapAnswerJson(answer)
  },
}

/**
 * A Monte Carlo run (`uncertainty draws N` on a sweep or a titration curve):
 * its points are the draws. A slice makes draws from `from` on (the same
 * deviates as at once: `drawShifts` skips the earlier ones) and stops
 * between two draws; it is stored as text, a draw's values per point of the
 * study (`drawSample`, JSON) a line. `finish` solves the study once without
 * Monte Carlo and attaches the bands of the draws made (all of them, or
 * those before a cancel, which the summary's note then says).
 */
export const monteCarloRunner: StudyRunner = {
  run(model, from, to, ctx) {
    const shifts = drawShifts(model, from)
    const bare = (drawn: Model) => (model.titration ? bareCurve(drawn, model.titration.values ?? [], ctx.solveOptions) : bareSweepPoints(drawn, ctx.solveOptions))
    const lines: string[] = []
    for (let d = from; d < to; d++) {
      // A draw that failed somewhere is left out there and counted in the bands' summary; the run's failed points are the study's (failedOf).
      lines.push(JSON.stringify(drawSample(bare(drawnModel(model, shifts())))))
      ctx.progress(lines.length)
      if (d + 1 < to && ctx.shouldStop()) break
    }
    return { count: lines.length, answer: lines.join('\n'), failed: 0 }
  },
  finish(model, parts, complete, solveOptions) {
    const samples: DrawSample[] = []
    for (const part of parts) if ('text' in part && part.text) for (const line of part.text.split('\n')) samples.push(JSON.parse(line) as DrawSample)
    // Cancelled before its first draw: nothing computed, as for any kind.
    if (!samples.length) return null
    const plain: Model = { ...model }
    delete plain.monteCarlo
    const draws = model.monteCarlo?.draws ?? 0
    const note = complete ? null : `${samples.length} of ${draws} draws were made before the run was cancelled: the bands rest on fewer draws than asked.`
    const bands = bandsFromDraws(model, samples, note)
    if (model.titration) {
      const result = titration(plain, solveOptions)
      if ('points' in result) result.points.forEach((point, i) => bands.attach(point, i))
      return JSON.stringify(result)
    }
    const result = sweep(plain, solveOptions)
    result.points.forEach((point, i) => bands.attach(point, i))
    return JSON.stringify(result)
  },
  failedOf(model, resultJson) {
    const result = JSON.parse(resultJson) as SweepResult | TitrationResult
    return model.titration ? failedTitrationPoints(result as TitrationResult) : (result as SweepResult).points.filter((p) => !p.converged).length
  },
}

/** The runner of each kind of kinds.ts, by its name. */
export const STUDY_RUNNERS: Record<string, StudyRunner> = {
  'monte-carlo': monteCarloRunner,
  map: mapRunner,
  titration: titrationRunner,
  sweep: sweepRunner,
  single: singleRunner,
}
