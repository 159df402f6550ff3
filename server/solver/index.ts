/**
 * The equilibrium solver: `solve` for one state of a model, `sweep` for the
 * study the model declares. Plain TypeScript with explicit imports, shared by
 * the server routes, the worker, the CLI, the tests and the benchmark.
 */
import type { Model } from '../../shared/poise/model'
import type { Result, SweepResult } from '../../shared/types/result'
import { presolve } from './presolve'
import { Workspace, type Limits, type SolverState } from './workspace'
import { canPrecipitate, saturationIndex, solveWithPhases, SUPERSATURATION_TOLERANCE } from './phases'
import { RESIDUAL_TOLERANCE } from './newton'
import { computeSpecies } from './equations'
import { MIN_NONZERO_TOTAL, MODE_BALANCE, MODE_TOTAL, buildProblem, setComponent, setTemperature, type Problem } from './problem'
import { buildResult } from './result'
import { limitWindows } from './limits'
import { shortcutOf } from '../../shared/results/shortcut'

/** The hand method's estimate beside a converged answer (shared/results/shortcut.ts); the answer itself is untouched. */
export function withShortcut(model: Model, result: Result): Result {
  if (!result.converged) return result
  const shortcut = shortcutOf(model, result)
  return shortcut ? { ...result, shortcut } : result
}
import { bufferCapacity } from './sensitivity'
import { attachLinearUncertainty } from './uncertainty'
import { monteCarloBands } from './montecarlo'

/** Stored with every run, so a result can be traced to the solver that made it. */
export const SOLVER_VERSION = '1.3.1'

/** Hard ceilings the server may rely on whatever a caller asks for. */
export const SOLVER_LIMITS = { maxIterations: 2000, timeBudgetMs: 60_000 } as const

export interface SolveOptions {
  /**
   * Newton iterations allowed for one set of solids (default 300); one
   * attempt may spend PHASE_BUDGET_FACTOR times this over all the sets it
   * tries. A solve makes at most MAX_ATTEMPTS attempts (two warm starts at a
   * sweep point, five cold guesses of pH, up to sixteen stages of activity
   * continuation, and when H+ is under a balance up to 33 solves that
   * bracket its pH), so it never runs more than MAX_ATTEMPTS ×
   * PHASE_BUDGET_FACTOR × this many iterations. This budget, not the clock, decides answers: the
   * same model gives the same answer on a busy or an idle server.
   */
  maxIterations?: number
  /**
   * Wall-clock guard in ms for this call (a whole sweep for `sweep`);
   * default 10 s. Only an outer safety limit against runaway work: a solve
   * or sweep point it stops is not converged and its reason says so.
   */
  timeBudgetMs?: number
  /** Absolute deadline as a Date.now() value; the earlier of this and timeBudgetMs applies. */
  deadline?: number
}

const DEFAULT_ITERATIONS = 300
const DEFAULT_BUDGET_MS = 10_000
/** Cold guesses of log10 a(H+) tried in turn when a solve fails. */
const PROTON_GUESSES = [-7, -3, -11, -1, -13]

/** The wall-clock guard of a call: its end as a performance.now() value and its length in ms. */
export function guardOf(options: SolveOptions | undefined): { deadline: number; guardMs: number } {
  const requested = options?.timeBudgetMs ?? DEFAULT_BUDGET_MS
  let guardMs = Math.max(0, Math.min(Number.isFinite(requested) ? requested : DEFAULT_BUDGET_MS, SOLVER_LIMITS.timeBudgetMs))
  if (options?.deadline !== undefined && Number.isFinite(options.deadline)) {
    guardMs = Math.max(0, Math.min(guardMs, options.deadline - Date.now()))
  }
  return { deadline: performance.now() + guardMs, guardMs }
}

export function iterationsOf(options: SolveOptions | undefined): number {
  const n = Math.floor(options?.maxIterations ?? DEFAULT_ITERATIONS)
  return Math.max(1, Math.min(Number.isFinite(n) ? n : DEFAULT_ITERATIONS, SOLVER_LIMITS.maxIterations))
}

export function newState(p: Problem): SolverState {
  return { y: new Float64Array(p.nc), x: new Float64Array(p.nc), n: new Float64Array(p.nsol), active: new Uint8Array(p.nsol), u: 0 }
}

export function copyState(to: SolverState, from: SolverState): void {
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

export interface Attempt { result: Result; ok: boolean }

/**
 * What keeps the final state from being an answer, checked on that state
 * alone whatever the loops reported: an equation whose scaled residual is
 * not below RESIDUAL_TOLERANCE, a present solid at a negative amount, or an
 * absent solid that could precipitate and is supersaturated. Null when none.
 */
function finalDefect(ws: Workspace, state: SolverState, result: Result): { what: string; advice: string } | null {
  const p = ws.p
  for (const e of result.residuals.equations ?? []) {
    if (!(e.scaled < RESIDUAL_TOLERANCE)) return { what: `${e.name} did not close (scaled residual ${e.scaled.toExponential(2)})`, advice: adviceFor(e.name) }
  }
  for (let s = 0; s < p.nsol; s++) {
    const name = p.model.solids[s].name
    if (state.active[s] && !(state.n[s] >= 0)) {
      return { what: `${name} ended at a negative amount (${state.n[s].toExponential(2)} mol/L)`, advice: adviceFor(`the saturation of ${name}`) }
    }
    if (!state.active[s] && canPrecipitate(p, s)) {
      const si = saturationIndex(p, state.x, s)
      if (!(si <= SUPERSATURATION_TOLERANCE)) return { what: `${name} is left supersaturated (SI ${si.toExponential(2)})`, advice: adviceFor(`the saturation of ${name}`) }
    }
  }
  return null
}

/** What the user can change when an equation does not close. */
function adviceFor(equation: string): string {
  if (equation.startsWith('the mass balance of ')) {
    const name = equation.slice('the mass balance of '.length)
    return `Check the total of ${name} and the constants of the species and solids that hold it; a total far beyond what can dissolve, or constants many orders apart, make it hard to close.`
  }
  if (equation.startsWith('the charge balance')) return 'Give H+ as a pH or a total instead of balance, or check that the totals given can balance the charge.'
  if (equation.startsWith('the saturation of ')) {
    const name = equation.slice('the saturation of '.length)
    return `Check the constant of ${name}; if it should not form here, mark it suppressed, or suppress a competing solid whose constant is close to it.`
  }
  if (equation === 'the ionic strength') return 'Fix the ionic strength, or use ideal activities, if the solution is beyond the range of the activity model.'
  if (equation === '') return 'Suppress the solids that cannot form here, or check the constants of those that compete for the same components.'
  return 'Check the totals and constants of the model.'
}

function attempt(ws: Workspace, state: SolverState, limits: Limits, iterationsBefore: number): Attempt {
  const out = solveWithPhases(ws, state, limits)
  const result = buildResult(ws, state, {
    converged: out.ok,
    iterations: iterationsBefore + out.iterations,
    notes: out.notes,
  })
  // Converged only when the final state itself checks out.
  const defect = finalDefect(ws, state, result)
  const ok = out.ok && defect === null
  result.converged = ok
  if (!ok) {
    if (out.timedOut) {
      result.reason = `Stopped by the time guard (${Math.round((limits.guardMs ?? DEFAULT_BUDGET_MS) / 1000)} s), a safety limit of the server rather than a property of the equations: ${out.reason ?? defect?.what}. Use fewer sweep points or a smaller system.`
    } else if (!out.ok) {
      result.reason = `Did not converge: ${out.reason}. ${adviceFor(out.equation ?? '')}`
    } else {
      result.reason = `Did not converge: ${defect!.what}. ${defect!.advice}`
    }
  }
  return { result, ok }
}

/** Fractions of the Debye–Hückel A walked through when a direct solve with activities fails. */
const ACTIVITY_HOMOTOPY = [0, 0.25, 0.5, 0.75, 0.9, 1]
/** Most stages (planned and halfway retries) one walk in A may take. */
const HOMOTOPY_STAGES_MAX = 16
/** pH values held first when bracketing H+'s own equation, and the bisections after. */
const BRACKET_PH = [0, 2, 4, 6, 8, 10, 12, 14]
const BRACKET_BISECTIONS = 24
/** Most attempts one solve makes (see SolveOptions.maxIterations). */
export const MAX_ATTEMPTS = 2 + PROTON_GUESSES.length + HOMOTOPY_STAGES_MAX + BRACKET_PH.length + BRACKET_BISECTIONS + 1

/**
 * Solves from each `warm` start in turn, then from cold guesses, then (with an activity
 * model) by continuation in A from ideal solution to the full model; keeps
 * the first success, or the last failure.
 */
export function solveProblem(ws: Workspace, state: SolverState, limits: Limits, warm: SolverState[]): Attempt {
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
    // guess and the answer; walking A up from 0 keeps each step small. A
    // stage that fails is retried halfway from the last stage that solved,
    // so one hard stretch does not end the walk.
    const fullA = p.A
    const good = newState(p)
    coldStart(ws, state, PROTON_GUESSES[0])
    try {
      let reached = -1
      let target = 0
      let tries = 0
      while (tries++ < HOMOTOPY_STAGES_MAX && performance.now() <= limits.deadline) {
        p.A = fullA * target
        const stage = attempt(ws, state, limits, spent)
        spent = stage.result.iterations
        if (stage.ok) {
          if (target === 1) return stage
          reached = target
          copyState(good, state)
          target = ACTIVITY_HOMOTOPY.find((f) => f > reached) ?? 1
        } else {
          last = stage
          if (reached < 0) break
          copyState(state, good)
          const halfway = (reached + target) / 2
          if (halfway - reached < 1e-3) break
          target = halfway
        }
      }
    } finally {
      p.A = fullA
    }
  }
  if (last && !last.ok && !limitsPassed(limits)) {
    const bracketed = bracketProton(ws, state, limits, spent)
    if (bracketed) {
      if (bracketed.ok) return bracketed
      spent = bracketed.result.iterations
    }
  }
  return last ?? attempt(ws, state, limits, spent)
}

const limitsPassed = (limits: Limits) => performance.now() > limits.deadline


/**
 * Last resort when H+ is under a balance (charge or total) and every other
 * start failed: holds the pH at a few values, solves each (H+ held is much
 * easier), finds where H+'s own equation changes sign — it moves one way
 * with pH when the other totals are held — bisects there, and starts the
 * full solve from the state found. Counted work (each held solve has the
 * usual budget), so deterministic. Null when it does not apply or finds no
 * sign change.
 */
function bracketProton(ws: Workspace, state: SolverState, limits: Limits, spentBefore: number): Attempt | null {
  const p = ws.p
  const j = p.hIndex
  if (j < 0 || (p.mode[j] !== MODE_BALANCE && p.mode[j] !== MODE_TOTAL)) return null
  const saved = { mode: p.mode[j], total: p.total[j], fixed: p.fixedLog[j] }
  let spent = spentBefore
  const held = newState(p)
  const best = newState(p)
  let found = false
  let bestPH = 7
  /** H+'s own equation at pH held, from the state in `held`; null when the held solve fails. */
  const residualAt = (pH: number, warm: boolean): number | null => {
    setComponent(p, j, 'pH', pH)
    if (!warm) coldStart(ws, held, -pH)
    const out = solveWithPhases(ws, held, limits)
    spent += out.iterations
    if (!out.ok) return null
    computeSpecies(ws, held)
    let sum = 0
    if (saved.mode === MODE_BALANCE) {
      for (let i = 0; i < p.nsp; i++) sum += p.charge[i] * ws.c[i]
    } else {
      for (let i = 0; i < p.nsp; i++) sum += p.nu[i * p.nc + j] * ws.c[i]
      for (let s = 0; s < p.nsol; s++) if (held.active[s]) sum += p.solidNu[s * p.nc + j] * held.n[s]
      sum -= saved.total
    }
    return Number.isFinite(sum) ? sum : null
  }
  try {
    let lo = -1
    let fLo = 0
    let hi = -1
    for (const pH of BRACKET_PH) {
      if (limitsPassed(limits)) return null
      const f = residualAt(pH, false)
      if (f === null) continue
      if (lo >= 0 && Math.sign(f) !== Math.sign(fLo)) { hi = pH; break }
      lo = pH; fLo = f; bestPH = pH
      copyState(best, held)
    }
    if (lo < 0 || hi < 0) return null
    // Bisect from the low end's state (warm starts: each step is small).
    let a = lo
    let b = hi
    for (let k = 0; k < BRACKET_BISECTIONS && !limitsPassed(limits); k++) {
      const mid = (a + b) / 2
      copyState(held, best)
      const f = residualAt(mid, true)
      if (f === null) break
      if (Math.sign(f) === Math.sign(fLo)) { a = mid; bestPH = mid; copyState(best, held) } else b = mid
    }
    found = true
  } finally {
    p.mode[j] = saved.mode; p.total[j] = saved.total; p.fixedLog[j] = saved.fixed
  }
  if (!found) return null
  // From the held state: H+'s free concentration where its activity was
  // held (γ depends on √I only, so computeSpecies gives it whatever y is).
  copyState(state, best)
  const own = p.componentSpecies[j]
  computeSpecies(ws, state)
  state.y[j] = -bestPH - (own >= 0 ? ws.g[own] : 0)
  return attempt(ws, state, limits, spent)
}

/** A Result for a model that could not be set up at all. */
export function unsolvable(model: Model | null | undefined, reason: string): Result {
  return {
    converged: false, iterations: 0,
    temperatureC: Number.isFinite(model?.temperatureC) ? (model as Model).temperatureC : 25,
    pH: 0, ionicStrength: 0, species: [], solids: [], gases: [], components: [],
    residuals: { maxScaled: 0 }, reason,
  }
}

export function internalFailure(model: Model, error: unknown): Result {
  const what = error instanceof Error ? error.message : String(error)
  return unsolvable(model, `The solver stopped on an internal error (${what}); please report this model.`)
}

/** Equilibrium of the model at its own conditions. Never throws. */
export function solve(model: Model, options?: SolveOptions): Result {
  try {
    const built = buildProblem(model)
    if ('error' in built) return unsolvable(model, built.error)
    const ws = new Workspace(built.problem)
    const limits = { maxIterations: iterationsOf(options), ...guardOf(options) }
    const state = newState(built.problem)
    const out = solveProblem(ws, state, limits, [])
    if (out.ok) {
      out.result.bufferCapacity = bufferCapacity(ws, state)
      attachLinearUncertainty(ws, state, out.result)
    }
    return withShortcut(model, out.result)
  } catch (error) {
    return internalFailure(model, error)
  }
}

/** A converged sweep point: its unknowns and where along the sweep it lies. */
export interface SweepPoint { state: SolverState; at: number }

/**
 * Predictor for continuation: extrapolates the unknowns to position t
 * through the last converged points, keeping the solids of the last one. A
 * parabola through three points when all three have the same solids (its
 * error is third order in the spacing, so a point usually needs one Newton
 * step less than after a secant), else the secant through two. False when
 * the points cannot define a line or t is far beyond them.
 */
export function predict(out: SolverState, t: number, points: SweepPoint[]): boolean {
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
export function applySweepValue(p: Problem, variable: string, j: number, v: number): string | null {
  if (!Number.isFinite(v)) return `the sweep value ${v} is not a number`
  switch (variable) {
    case 'pH':
      setComponent(p, j, 'pH', v)
      return null
    case 'total':
      if (v < 0) return `a total of ${v} mol/L is negative`
      if (v !== 0 && v < MIN_NONZERO_TOTAL) return `a total of ${v} mol/L is closer to 0 than ${MIN_NONZERO_TOTAL} mol/L, beyond what the arithmetic can resolve`
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
  return axisComponentIndex(model, model.sweep!)
}

/** The component an axis sets (−1 for temperature), or why it cannot be found. */
export function axisComponentIndex(model: Model, sw: { variable: string; component: string | null }): { index: number } | { error: string } {
  if (sw.variable === 'temperature') return { index: -1 }
  const name = sw.variable === 'pH' ? 'H+' : sw.component
  const index = model.components.findIndex((c) => c.name === name)
  if (index < 0) return { error: `the sweep names ${name ?? 'no component'}, which is not a component of the model` }
  return { index }
}

/**
 * One solve of the model at sweep value v (the swept variable set to v; for
 * temperature, every constant moved to it), from a cold start. The limit
 * windows locate their ends with it. Never throws.
 */
export function solveAtSweepValue(model: Model, v: number, options?: SolveOptions): Result {
  try {
    const built = buildProblem(model)
    if ('error' in built) return unsolvable(model, built.error)
    const p = built.problem
    const target = sweepComponentIndex(model)
    if ('error' in target) return unsolvable(model, `The sweep cannot run: ${target.error}.`)
    const bad = applySweepValue(p, model.sweep!.variable, target.index, v)
    if (bad) return unsolvable(model, `This sweep value cannot be solved: ${bad}.`)
    const ws = new Workspace(p)
    return solveProblem(ws, newState(p), { maxIterations: iterationsOf(options), ...guardOf(options) }, []).result
  } catch (error) {
    return internalFailure(model, error)
  }
}

/**
 * Continuation along a path of values: each point starts from a prediction
 * through the previous converged points, or else from the last one; a
 * point that fails is marked converged:false with its reason and the path
 * goes on. `apply` moves the problem to a value (or says why it cannot);
 * `position` is where a value lies for the prediction (log10 for a log
 * sweep); `onPoint` sees each converged state (for sensitivities); `keep`
 * gives what the answer keeps of each point (the point itself by default).
 * Used by sweeps and titrations.
 */
export function continueAlong(
  ws: Workspace, values: number[], position: (v: number) => number, apply: (v: number) => string | null,
  options: SolveOptions | undefined, noun: 'sweep' | 'titration',
  onPoint?: (index: number, state: SolverState, result: Result) => void, guard = guardOf(options),
  keep: (result: Result) => Result = (result) => result,
): Result[] {
  const p = ws.p
  const model = p.model
  const out: Result[] = []
  const state = newState(p)
  const predicted = newState(p)
  // The last three converged points, newest first; their states are reused round robin.
  const recent: SweepPoint[] = []
  const spare: SolverState[] = [newState(p), newState(p), newState(p)]
  const maxIterations = iterationsOf(options)
  values.forEach((v, index) => {
    const bad = apply(v)
    if (bad) { out.push(keep(unsolvable(model, `This ${noun} point cannot be solved: ${bad}.`))); return }
    if (performance.now() > guard.deadline) {
      out.push(keep(unsolvable(model, `Not solved: the time guard of the ${noun} (${Math.round(guard.guardMs / 1000)} s, a safety limit of the server) ran out before this point. Use fewer ${noun} points or a smaller system.`)))
      return
    }
    const starts: SolverState[] = []
    if (recent.length >= 2 && predict(predicted, position(v), recent)) starts.push(predicted)
    if (recent.length >= 1) starts.push(recent[0].state)
    const solved = solveProblem(ws, state, { maxIterations, ...guard }, starts)
    if (solved.ok) {
      const slot = recent.length === 3 ? recent.pop()!.state : spare.pop()!
      copyState(slot, state)
      recent.unshift({ state: slot, at: position(v) })
      onPoint?.(index, state, solved.result)
    }
    out.push(keep(solved.result))
  })
  return out
}

/**
 * The model's sweep: each point starts from a prediction through the
 * previous converged points, or else from the last one (continuation);
 * a point that fails is marked converged:false with its reason and the sweep
 * goes on. Never throws.
 */
export interface SweepOptions extends SolveOptions {
  /**
   * Sees each point as it is solved, in order, and gives what the answer
   * keeps of it: a caller that writes points out as they come (the worker)
   * keeps only `converged` and `components`, which the limit windows read,
   * so a long sweep does not hold every point's objects. Points of a sweep
   * that cannot run at all are not passed through it.
   */
  keepPoint?: (point: Result) => Result
}

/** Share of a sweep's or titration's time guard the Monte Carlo draws may take. */
export const MONTE_CARLO_SHARE = 0.8

/** The points of a model's sweep and nothing else (no shortcut, no limit windows): one Monte Carlo draw. */
export function bareSweepPoints(model: Model, options: SolveOptions): Result[] {
  const sw = model.sweep!
  const built = buildProblem(model)
  if ('error' in built) return sw.values.map(() => unsolvable(model, built.error))
  const p = built.problem
  const target = sweepComponentIndex(model)
  if ('error' in target) return sw.values.map(() => unsolvable(model, target.error))
  const position = (v: number) => (sw.log && v > 0 ? Math.log10(v) : v)
  return continueAlong(new Workspace(p), sw.values, position, (v) => applySweepValue(p, sw.variable, target.index, v), options, 'sweep')
}

export function sweep(model: Model, options?: SweepOptions): SweepResult {
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
    const position = (v: number) => (sw.log && v > 0 ? Math.log10(v) : v)
    const keepPoint = options?.keepPoint
    // `uncertainty draws N`: the draws come first (each point is written out as soon as it is solved),
    // within most of the time guard; the sweep itself keeps the whole guard's end.
    const { guardMs } = guardOf(options)
    const end = Date.now() + guardMs
    const bands = model.monteCarlo ? monteCarloBands(model, Date.now() + MONTE_CARLO_SHARE * guardMs, { maxIterations: options?.maxIterations }, bareSweepPoints) : null
    let index = 0
    const keep = (r: Result) => {
      bands?.attach(r, index++)
      return keepPoint ? keepPoint(withShortcut(model, r)) : withShortcut(model, r)
    }
    const mainOptions = bands ? { ...options, deadline: Math.min(options?.deadline ?? Infinity, end) } : options
    base.points.push(...continueAlong(ws, values, position, (v) => applySweepValue(p, sw.variable, target.index, v), mainOptions, 'sweep', undefined, undefined, keep))
    // Limit windows: their ends located by exact solves between the grid points.
    if (model.limits?.length) base.limits = limitWindows(model, base, (v) => solveAtSweepValue(model, v, options))
    return base
  } catch (error) {
    return { ...base, points: [internalFailure(model, error)] }
  }
}

export { titration } from './titration'
export { solveMap, type MapOptions } from './map'
export type { Result, SweepResult }
