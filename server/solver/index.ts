/**
 * The equilibrium solver: `solve` for one state of a model, `sweep` for the
 * study the model declares. Plain TypeScript with explicit imports, shared by
 * the server routes, the worker, the CLI, the tests and the benchmark.
 */
import type { Model } from '../../shared/poise/model'
import type { Result, SweepResult } from '../../shared/types/result'
import { presolve } from './presolve'
import { Workspace, type Limits, type SolverState } from './workspace'
import { solveWithPhases } from './phases'
import { MODE_BALANCE, MODE_TOTAL, buildProblem, setComponent, setTemperature, type Problem } from './problem'
import { buildResult } from './report'

/** Stored with every run, so a result can be traced to the solver that made it. */
export const SOLVER_VERSION = '1.0.0'

/** Hard ceilings the server may rely on whatever a caller asks for. */
export const SOLVER_LIMITS = { maxIterations: 2000, timeBudgetMs: 60_000 } as const

export interface SolveOptions {
  /**
   * Newton iterations allowed for one attempt, all solid sets together
   * (default 300). A solve makes at most 11 attempts (two warm starts at a
   * sweep point, three cold guesses of pH, six stages of activity
   * continuation), so it never runs more than 11 × this many iterations.
   */
  maxIterations?: number
  /** Wall-clock budget in ms for this call (a whole sweep for `sweep`); default 10 s. */
  timeBudgetMs?: number
  /** Absolute deadline as a Date.now() value; the earlier of this and timeBudgetMs applies. */
  deadline?: number
}

const DEFAULT_ITERATIONS = 300
const DEFAULT_BUDGET_MS = 10_000
/** Cold guesses of log10 a(H+) tried in turn when a solve fails. */
const PROTON_GUESSES = [-7, -3, -11]

function deadlineOf(options: SolveOptions | undefined): number {
  const budget = Math.min(options?.timeBudgetMs ?? DEFAULT_BUDGET_MS, SOLVER_LIMITS.timeBudgetMs)
  let end = performance.now() + Math.max(0, budget)
  if (options?.deadline !== undefined && Number.isFinite(options.deadline)) {
    end = Math.min(end, performance.now() + (options.deadline - Date.now()))
  }
  return end
}

function iterationsOf(options: SolveOptions | undefined): number {
  const n = Math.floor(options?.maxIterations ?? DEFAULT_ITERATIONS)
  return Math.max(1, Math.min(Number.isFinite(n) ? n : DEFAULT_ITERATIONS, SOLVER_LIMITS.maxIterations))
}

function newState(p: Problem): SolverState {
  return { y: new Float64Array(p.nc), x: new Float64Array(p.nc), n: new Float64Array(p.nsol), active: new Uint8Array(p.nsol), u: 0 }
}

function copyState(to: SolverState, from: SolverState): void {
  to.y.set(from.y); to.x.set(from.x); to.n.set(from.n); to.active.set(from.active); to.u = from.u
}

/** Starting point: free forms at their totals, H+ at the given log activity, √I from the totals, then presolved. */
function coldStart(ws: Workspace, state: SolverState, logH: number): void {
  const p = ws.p
  let half = 0
  for (let j = 0; j < p.nc; j++) {
    const c = p.model.components[j]
    if (p.mode[j] === MODE_TOTAL || p.mode[j] === MODE_BALANCE) {
      const t = p.total[j]
      state.y[j] = j === p.hIndex ? logH : p.mode[j] === MODE_TOTAL && t > 0 ? Math.log10(t) : -10
      if (t > 0) half += c.charge * c.charge * t
    } else if (c.mode === 'free') {
      half += c.charge * c.charge * c.value
    }
  }
  state.n.fill(0)
  state.active.fill(0)
  state.u = Math.min(Math.sqrt(0.5 * half), 3)
  presolve(ws, state)
}

interface Attempt { result: Result; ok: boolean }

function attempt(ws: Workspace, state: SolverState, limits: Limits, iterationsBefore: number): Attempt {
  const out = solveWithPhases(ws, state, limits)
  const result = buildResult(ws, state, {
    converged: out.ok,
    iterations: iterationsBefore + out.iterations,
    reason: out.ok ? undefined : `Did not converge: ${out.reason}.`,
    notes: out.notes,
  })
  return { result, ok: out.ok }
}

/** Fractions of the Debye–Hückel A walked through when a direct solve with activities fails. */
const ACTIVITY_HOMOTOPY = [0, 0.25, 0.5, 0.75, 0.9, 1]

/**
 * Solves from each `warm` start in turn, then from cold guesses, then (with an activity
 * model) by continuation in A from ideal solution to the full model; keeps
 * the first success, or the last failure.
 */
function solveProblem(ws: Workspace, state: SolverState, limits: Limits, warm: SolverState[]): Attempt {
  const p = ws.p
  let spent = 0
  let last: Attempt | null = null
  for (const start of warm) {
    copyState(state, start)
    last = attempt(ws, state, limits, spent)
    if (last.ok) return last
    spent = last.result.iterations
  }
  for (const logH of PROTON_GUESSES) {
    if (performance.now() > limits.deadline) break
    coldStart(ws, state, logH)
    last = attempt(ws, state, limits, spent)
    if (last.ok) return last
    spent = last.result.iterations
    if (p.hIndex < 0 || p.mode[p.hIndex] > MODE_BALANCE) break
  }
  if (p.activity !== 0 && p.fixedRootI < 0 && performance.now() <= limits.deadline) {
    // At high ionic strength γ can change by orders of magnitude between the
    // guess and the answer; walking A up from 0 keeps each step small.
    const fullA = p.A
    coldStart(ws, state, PROTON_GUESSES[0])
    try {
      for (const f of ACTIVITY_HOMOTOPY) {
        p.A = fullA * f
        const stage = attempt(ws, state, limits, spent)
        spent = stage.result.iterations
        if (f === 1 || !stage.ok) { last = stage; break }
      }
    } finally {
      p.A = fullA
    }
  }
  return last ?? attempt(ws, state, limits, spent)
}

/** A Result for a model that could not be set up at all. */
function unsolvable(model: Model | null | undefined, reason: string): Result {
  return {
    converged: false, iterations: 0,
    temperatureC: Number.isFinite(model?.temperatureC) ? (model as Model).temperatureC : 25,
    pH: 0, ionicStrength: 0, species: [], solids: [], gases: [], components: [],
    residuals: { maxScaled: 0 }, reason,
  }
}

function internalFailure(model: Model, error: unknown): Result {
  const what = error instanceof Error ? error.message : String(error)
  return unsolvable(model, `The solver stopped on an internal error (${what}); please report this model.`)
}

/** Equilibrium of the model at its own conditions. Never throws. */
export function solve(model: Model, options?: SolveOptions): Result {
  try {
    const built = buildProblem(model)
    if ('error' in built) return unsolvable(model, built.error)
    const ws = new Workspace(built.problem)
    const limits = { maxIterations: iterationsOf(options), deadline: deadlineOf(options) }
    return solveProblem(ws, newState(built.problem), limits, []).result
  } catch (error) {
    return internalFailure(model, error)
  }
}

/** A converged sweep point: its unknowns and where along the sweep it lies. */
interface SweepPoint { state: SolverState; at: number }

/**
 * Predictor for continuation: extrapolates the unknowns to position t
 * through the last converged points, keeping the solids of the last one. A
 * parabola through three points when all three have the same solids (its
 * error is third order in the spacing, so a point usually needs one Newton
 * step less than after a secant), else the secant through two. False when
 * the points cannot define a line or t is far beyond them.
 */
function predict(out: SolverState, t: number, points: SweepPoint[]): boolean {
  const [last, before, oldest] = points
  const span = last.at - before.at
  if (!Number.isFinite(span) || span === 0 || !Number.isFinite(t)) return false
  if (Math.abs((t - last.at) / span) > 2) return false
  const sameSolids = (a: SolverState, b: SolverState) => a.active.every((v, s) => v === b.active[s])
  const quadratic = oldest !== undefined && Number.isFinite(oldest.at) && oldest.at !== last.at && oldest.at !== before.at
    && sameSolids(last.state, before.state) && sameSolids(last.state, oldest.state)
  // Lagrange weights of the points used.
  let w0: number, w1: number, w2 = 0
  if (quadratic) {
    const t0 = last.at, t1 = before.at, t2 = oldest.at
    w0 = ((t - t1) * (t - t2)) / ((t0 - t1) * (t0 - t2))
    w1 = ((t - t0) * (t - t2)) / ((t1 - t0) * (t1 - t2))
    w2 = ((t - t0) * (t - t1)) / ((t2 - t0) * (t2 - t1))
  } else {
    const f = (t - last.at) / span
    w0 = 1 + f
    w1 = -f
  }
  const a = last.state, b = before.state, c = quadratic ? oldest.state : last.state
  copyState(out, a)
  for (let j = 0; j < out.y.length; j++) out.y[j] = w0 * a.y[j] + w1 * b.y[j] + w2 * c.y[j]
  for (let s = 0; s < out.n.length; s++) {
    if (a.active[s] && b.active[s]) out.n[s] = Math.max(0, w0 * a.n[s] + w1 * b.n[s] + w2 * c.n[s])
  }
  out.u = Math.max(0, w0 * a.u + w1 * b.u + w2 * c.u)
  return true
}

/** Moves the problem to sweep value v; returns why it cannot, or null. */
function applySweepValue(p: Problem, variable: string, j: number, v: number): string | null {
  if (!Number.isFinite(v)) return `the sweep value ${v} is not a number`
  switch (variable) {
    case 'pH':
      setComponent(p, j, 'pH', v)
      return null
    case 'total':
      if (v < 0) return `a total of ${v} mol/L is negative`
      setComponent(p, j, 'total', v)
      return null
    case 'pressure':
      if (v <= 0) return `a pressure of ${v} atm is not positive`
      setComponent(p, j, 'pressure', v)
      return null
    case 'temperature':
      if (v <= -273.15) return `${v} °C is below absolute zero`
      setTemperature(p, v)
      return null
    default:
      return `the sweep variable ${variable} is not known`
  }
}

function sweepComponentIndex(model: Model): { index: number } | { error: string } {
  const sw = model.sweep!
  if (sw.variable === 'temperature') return { index: -1 }
  const name = sw.variable === 'pH' ? 'H+' : sw.component
  const index = model.components.findIndex((c) => c.name === name)
  if (index < 0) return { error: `the sweep names ${name ?? 'no component'}, which is not a component of the model` }
  return { index }
}

/**
 * The model's sweep: each point starts from a prediction through the
 * previous converged points, or else from the last one (continuation);
 * a point that fails is marked converged:false with its reason and the sweep
 * goes on. Never throws.
 */
export function sweep(model: Model, options?: SolveOptions): SweepResult {
  const sw = model?.sweep
  const values = Array.isArray(sw?.values) ? sw.values : []
  const base: SweepResult = { variable: sw?.variable ?? 'pH', component: sw?.component ?? null, values, points: [] }
  if (!sw) return { ...base, points: [unsolvable(model, 'The model declares no sweep.')] }
  try {
    const built = buildProblem(model)
    if ('error' in built) return { ...base, points: values.map(() => unsolvable(model, built.error)) }
    const p = built.problem
    const target = sweepComponentIndex(model)
    if ('error' in target) return { ...base, points: values.map(() => unsolvable(model, `The sweep cannot run: ${target.error}.`)) }
    const ws = new Workspace(p)
    const state = newState(p)
    const predicted = newState(p)
    // The last three converged points, newest first; their states are reused round robin.
    const recent: SweepPoint[] = []
    const spare: SolverState[] = [newState(p), newState(p), newState(p)]
    const maxIterations = iterationsOf(options)
    const deadline = deadlineOf(options)
    const position = (v: number) => (sw.log && v > 0 ? Math.log10(v) : v)
    for (const v of values) {
      const bad = applySweepValue(p, sw.variable, target.index, v)
      if (bad) { base.points.push(unsolvable(model, `This sweep point cannot be solved: ${bad}.`)); continue }
      if (performance.now() > deadline) {
        base.points.push(unsolvable(model, 'The time limit for the sweep ran out before this point.'))
        continue
      }
      const starts: SolverState[] = []
      if (recent.length >= 2 && predict(predicted, position(v), recent)) starts.push(predicted)
      if (recent.length >= 1) starts.push(recent[0].state)
      const out = solveProblem(ws, state, { maxIterations, deadline }, starts)
      if (out.ok) {
        const slot = recent.length === 3 ? recent.pop()!.state : spare.pop()!
        copyState(slot, state)
        recent.unshift({ state: slot, at: position(v) })
      }
      base.points.push(out.result)
    }
    return base
  } catch (error) {
    return { ...base, points: [internalFailure(model, error)] }
  }
}

export type { Result, SweepResult }
