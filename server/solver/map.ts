/**
 * A map: the model solved over a grid of two axes (`map X by Y`). Each row
 * (one y value) is a sweep along x by continuation, as `sweep` runs one;
 * each cell also starts from the cell above it (the row before, same x), so
 * a row's first cell — and any cell where the row's own prediction fails,
 * such as where a solid appears — begins next to its answer. A map thus
 * costs about what its cells cost as sweep points. A cell that fails is
 * marked not converged with its reason and the map goes on.
 *
 * The cells go into columns as they are solved (ColumnsBuilder), so a map
 * never holds every cell's Result; `mapCell` makes one on demand. The
 * runner reports progress and asks whether to stop, so a job can show the
 * one and honour the other.
 */
import type { Model, ModelSweep } from '../../shared/poise/model'
import type { MapAnswer, MapAxis, Result } from '../../shared/types/result'
import { ColumnsBuilder } from '../../shared/results/sweep-columns'
import { buildProblem } from './problem'
import { Workspace, type SolverState } from './workspace'
import {
  applySweepValue, axisComponentIndex, copyState, guardOf, internalFailure, iterationsOf, newState, predict, solveProblem,
  unsolvable, withShortcut, type SolveOptions, type SweepPoint,
} from './index'

export interface MapOptions extends SolveOptions {
  /**
   * Told how many cells are done of how many: after each row, and within a
   * row at most every `progressEveryMs` (default 250 ms). Never thrown into.
   */
  onProgress?: (done: number, total: number) => void
  progressEveryMs?: number
  /** Asked before each cell; once it answers true the map stops, keeping the cells done. */
  cancelled?: () => boolean
  /**
   * Only rows [from, to) (a job's slice): the answer's cells are those rows'
   * (cell 0 is the first cell of row `from`), the first row started afresh
   * (cold starts, then along the row). Default: every row.
   */
  rows?: { from: number; to: number }
  /** Sees each cell as it is solved, by its index over the whole grid (row × nx + column), before it goes into the columns. */
  onCell?: (index: number, cell: Result) => void
}

export const CANCELLED_CELL_REASON = 'Not solved: the map was cancelled before this cell.'

function axisOf(sw: ModelSweep): MapAxis {
  return { variable: sw.variable, component: sw.component, values: sw.values, log: sw.log }
}

/** The model's map, cell by cell; never throws. */
export function solveMap(model: Model, options: MapOptions = {}): MapAnswer {
  const map = model.map
  const x: MapAxis = map ? axisOf(map.x) : { variable: 'pH', component: null, values: [], log: false }
  const yAll: MapAxis = map ? axisOf(map.y) : { variable: 'pH', component: null, values: [], log: false }
  const nx = x.values.length
  const firstRow = Math.max(0, Math.min(yAll.values.length, Math.floor(options.rows?.from ?? 0)))
  const endRow = Math.max(firstRow, Math.min(yAll.values.length, Math.floor(options.rows?.to ?? yAll.values.length)))
  // The answer's y axis holds the rows solved, so its cells read as a map of their own.
  const y: MapAxis = firstRow === 0 && endRow === yAll.values.length ? yAll : { ...yAll, values: yAll.values.slice(firstRow, endRow) }
  const total = nx * (endRow - firstRow)
  const cells = new ColumnsBuilder()
  let failedCells = 0
  let cancelled = false
  const add = (r: Result) => {
    if (!r.converged) failedCells++
    options.onCell?.(firstRow * nx + cells.length, r)
    cells.add(r)
  }
  const fillRest = (reason: string) => {
    const r = unsolvable(model, reason)
    while (cells.length < total) add(r)
  }
  const answer = (): MapAnswer => ({ format: 'map-columns', x, y, cells: cells.build(), cellsDone: cancelled ? done : total, failedCells, cancelled })
  let done = 0
  if (!map) return { format: 'map-columns', x, y, cells: cells.build(), cellsDone: 0, failedCells: 0, cancelled: false }
  try {
    const built = buildProblem(model)
    if ('error' in built) { fillRest(built.error); return answer() }
    const p = built.problem
    const xTarget = axisComponentIndex(model, map.x)
    const yTarget = axisComponentIndex(model, map.y)
    const problem = 'error' in xTarget ? xTarget.error : 'error' in yTarget ? yTarget.error : null
    if (problem || 'error' in xTarget || 'error' in yTarget) { fillRest(`The map cannot run: ${problem}.`); return answer() }
    const ws = new Workspace(p)
    const guard = guardOf(options)
    const limits = { maxIterations: iterationsOf(options), ...guard }
    const position = (v: number) => (map.x.log && v > 0 ? Math.log10(v) : v)
    const state = newState(p)
    const predicted = newState(p)
    // The converged state of the row before at each column (the start of the cell below it).
    const above = Array.from({ length: nx }, () => newState(p))
    const aboveOk = new Uint8Array(nx)
    // The last three converged cells of the current row, newest first; states reused round robin.
    const recent: SweepPoint[] = []
    const spare: SolverState[] = [newState(p), newState(p), newState(p)]
    const every = options.progressEveryMs ?? 250
    let lastReport = performance.now()
    const report = () => {
      lastReport = performance.now()
      try { options.onProgress?.(done, total) } catch { /* a listener's failure is not the map's */ }
    }
    for (let i = firstRow; i < endRow; i++) {
      const badRow = applySweepValue(p, map.y.variable, yTarget.index, yAll.values[i]!)
      while (recent.length) spare.push(recent.pop()!.state)
      for (let j = 0; j < nx; j++) {
        if (options.cancelled?.()) {
          cancelled = true
          fillRest(CANCELLED_CELL_REASON)
          report()
          return answer()
        }
        const v = x.values[j]
        const bad = badRow ?? applySweepValue(p, map.x.variable, xTarget.index, v)
        if (bad) {
          aboveOk[j] = 0
          add(unsolvable(model, `This map cell cannot be solved: ${bad}.`))
        } else if (performance.now() > guard.deadline) {
          aboveOk[j] = 0
          add(unsolvable(model, `Not solved: the time guard of the map (${Math.round(guard.guardMs / 1000)} s, a safety limit of the server) ran out before this cell. Use fewer points on an axis or a smaller system.`))
        } else {
          const starts: SolverState[] = []
          if (recent.length >= 2 && predict(predicted, position(v), recent)) starts.push(predicted)
          if (aboveOk[j]) starts.push(above[j])
          if (recent.length >= 1) starts.push(recent[0].state)
          const solved = solveProblem(ws, state, limits, starts)
          if (solved.ok) {
            const slot = recent.length === 3 ? recent.pop()!.state : spare.pop()!
            copyState(slot, state)
            recent.unshift({ state: slot, at: position(v) })
            copyState(above[j], state)
            aboveOk[j] = 1
          } else {
            aboveOk[j] = 0
          }
          add(withShortcut(model, solved.result))
        }
        done++
        if (options.onProgress && performance.now() - lastReport >= every) report()
      }
      report()
    }
    return answer()
  } catch (error) {
    fillRest(internalFailure(model, error).reason!)
    return answer()
  }
}
