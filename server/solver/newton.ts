/**
 * Damped Newton–Raphson for one active set of solids. Unknowns: log10 of the
 * free concentration of the components under a mass or charge balance (their
 * log10 activity follows with γ), the amounts of the present solids, and
 * u = √I when the activity model needs it, so ionic strength is solved with
 * everything else instead of iterated around it. Concentrations rather than
 * activities as unknowns keep the free forms still while u moves, which is
 * what makes the joint Newton step safe at high ionic strength.
 */
import { Matrix, SingularValueDecomposition } from 'ml-matrix'
import { MODE_TOTAL } from './problem'
import { assembleJacobian, computeResiduals, computeSpecies } from './equations'
import type { Limits, NewtonOutcome, SolverState, Workspace } from './workspace'
import type { SparseLu } from './sparse-lu'

/** Every scaled residual must fall below this. */
export const RESIDUAL_TOLERANCE = 1e-10
/** And the last Newton step below this, in log10 units. */
export const STEP_TOLERANCE = 1e-12
/** Largest change of any log10 a in one iteration. */
const MAX_LOG_STEP = 1.5
/**
 * A step this small (in stepSize units) changes the Jacobian by about as
 * little, so its factors still give the next step to five digits.
 */
const CHORD_STEP_LIMIT = 1e-6
/** Largest change of √I in one iteration. */
const MAX_ROOT_I_STEP = 0.5
/** Iterations in a row with a present solid below zero before Newton gives the set back. */
const NEGATIVE_PATIENCE = 12

function anyPresentNegative(ws: Workspace, state: SolverState): boolean {
  for (let a = 0; a < ws.nActive; a++) if (state.n[ws.rowSolid[a]] < 0) return true
  return false
}

/** Halvings of the step before the line search gives up. */
const LINE_SEARCH_HALVINGS = 40
/** Iterations in a row spent below the residual tolerance without the step shrinking: the rounding floor. */
const FLOOR_ITERATIONS = 3

/** Sets ws.worstMax and ws.worstRow: the largest scaled residual and its row. */
function findWorst(ws: Workspace): void {
  let max = 0
  let row = 0
  for (let r = 0; r < ws.dim; r++) {
    const v = Math.abs(ws.F[r] / ws.scale[r])
    if (!(v <= max)) { max = Number.isNaN(v) ? Infinity : v; row = r }
  }
  ws.worstMax = max
  ws.worstRow = row
}

function meritOf(ws: Workspace, F: Float64Array, scale: Float64Array): number {
  let m = 0
  for (let r = 0; r < ws.dim; r++) { const v = F[r] / scale[r]; m += v * v }
  return Number.isNaN(m) ? Infinity : m
}

/** Writes the unknowns plus t·delta into (y, n) from (y0, n0); returns the new u. */
function applyStep(ws: Workspace, state: SolverState, u0: number, t: number): number {
  const nr = ws.nUnknownComponents
  for (let r = 0; r < nr; r++) { const j = ws.rowComponent[r]; state.y[j] = ws.y0[j] + t * ws.delta[r] }
  // A solid cannot hold more of a component than its total: without this
  // bound a first step can overshoot and leave the free forms nowhere to go.
  for (let a = 0; a < ws.nActive; a++) {
    const s = ws.rowSolid[a]
    state.n[s] = Math.min(ws.n0[s] + t * ws.delta[nr + a], ws.maxAmount[a])
  }
  // √I may shrink tenfold at most in one step: it must stay positive.
  return ws.hasU ? Math.max(0.1 * u0, u0 + t * ws.delta[nr + ws.nActive]) : u0
}

/**
 * Whether the present solids are dependent by stoichiometry alone: their
 * saturation equations over the unknown activities, or their amounts in the
 * mass balances, are linear combinations of each other (rank below their
 * number). Then no point satisfies them all and the phase loop must swap.
 */
function solidsDependent(ws: Workspace): boolean {
  const p = ws.p
  const na = ws.nActive
  const nr = ws.nUnknownComponents
  const saturation = new Matrix(na, Math.max(nr, 1))
  const amounts = new Matrix(na, Math.max(nr, 1))
  for (let a = 0; a < na; a++) {
    const s = ws.rowSolid[a]
    for (let r = 0; r < nr; r++) {
      const j = ws.rowComponent[r]
      const v = p.solidNu[s * p.nc + j]
      saturation.set(a, r, v)
      if (p.mode[j] === MODE_TOTAL) amounts.set(a, r, v)
    }
  }
  const svd = { autoTranspose: true }
  return new SingularValueDecomposition(saturation, svd).rank < na || new SingularValueDecomposition(amounts, svd).rank < na
}

/**
 * Solves J·delta = −F/scale; false when J is singular because the present
 * solids are dependent (the phase loop resolves that). Any other singular J
 * only means one species swamps the others (rows in proportion), and a small
 * diagonal shift (Levenberg–Marquardt) still gives a descent direction.
 */
function newtonDirection(ws: Workspace, state: SolverState): boolean {
  const dim = ws.dim
  const J = ws.matrix(dim)
  assembleJacobian(ws, state.u, ws.scale, J)
  const lu = ws.lu
  const rows = (J as unknown as { data: Float64Array[] }).data
  ws.factors = null
  lu.factor(rows, dim)
  if (nearlySingular(lu)) {
    if (ws.nActive > 0 && solidsDependent(ws)) return false
    // The factorisation overwrote J (in place): build it again to shift it.
    assembleJacobian(ws, state.u, ws.scale, J)
    let biggest = 0
    for (let r = 0; r < dim; r++) for (let k = 0; k < dim; k++) biggest = Math.max(biggest, Math.abs(rows[r][k]))
    const shift = Math.max(biggest, 1) * 1e-8
    for (let r = 0; r < dim; r++) rows[r][r] += shift
    lu.factor(rows, dim)
    if (nearlySingular(lu)) return false
  }
  ws.factors = null
  if (!solveWithFactors(ws, lu, ws.scale)) return false
  ws.factors = lu
  ws.factorScale.set(ws.scale)
  return true
}

/**
 * Relative size below which a pivot of the scaled Jacobian counts as zero:
 * rows are scaled to order one, so a pivot this far below the largest is
 * rounding of a dependent row, not information (common practice: a few
 * hundred times the double epsilon).
 */
const PIVOT_TOLERANCE = 1e-13

/** Whether the LU factors have a pivot that is zero relative to the largest one. */
function nearlySingular(lu: SparseLu): boolean {
  const { smallest, largest } = lu.pivotRange()
  if (!(largest > 0) || !Number.isFinite(largest)) return true
  return !(smallest > largest * PIVOT_TOLERANCE)
}

/** delta from factors of the Jacobian scaled by `scale`: J·delta = −F/scale. False when not finite. */
function solveWithFactors(ws: Workspace, lu: SparseLu, scale: Float64Array): boolean {
  const dim = ws.dim
  const b = ws.rhs
  for (let r = 0; r < dim; r++) b[r] = -ws.F[r] / scale[r]
  lu.solve(b, ws.delta)
  for (let r = 0; r < dim; r++) if (!Number.isFinite(ws.delta[r])) return false
  return true
}

/** Size of the step for the convergence test: log units for activities, relative for amounts and √I. */
function stepSize(ws: Workspace, state: SolverState): number {
  const p = ws.p
  const nr = ws.nUnknownComponents
  let m = 0
  for (let r = 0; r < nr; r++) m = Math.max(m, Math.abs(ws.delta[r]))
  for (let a = 0; a < ws.nActive; a++) {
    const s = ws.rowSolid[a]
    let ref = Math.abs(state.n[s])
    for (let j = 0; j < p.nc; j++) ref = Math.max(ref, Math.abs(p.solidNu[s * p.nc + j] * p.total[j]))
    m = Math.max(m, Math.abs(ws.delta[nr + a]) / (ref > 0 ? ref : 1))
  }
  if (ws.hasU) m = Math.max(m, Math.abs(ws.delta[nr + ws.nActive]) / Math.max(state.u, 1e-12))
  return m
}

/** Back to the point the step started from (saved in y0, n0 and u0), with its species and residuals. */
function restoreStart(ws: Workspace, state: SolverState, u0: number): void {
  state.y.set(ws.y0)
  state.n.set(ws.n0)
  state.u = u0
  computeSpecies(ws, state)
  computeResiduals(ws, state, ws.F, ws.scale)
  findWorst(ws)
}

/**
 * Takes the last, tiny step in ws.delta (it brings the answer to rounding
 * level), evaluates the state it reaches and keeps it only when its residuals
 * are no worse; otherwise goes back to the point before it, which already met
 * the tolerance. Either way the species in ws are those of the state returned,
 * and the outcome reports the residuals evaluated there.
 */
function finalStep(ws: Workspace, state: SolverState, it: number): NewtonOutcome {
  const before = ws.worstMax
  const u0 = state.u
  ws.y0.set(state.y)
  ws.n0.set(state.n)
  state.u = applyStep(ws, state, u0, 1)
  computeSpecies(ws, state)
  computeResiduals(ws, state, ws.F, ws.scale)
  findWorst(ws)
  if (!(ws.worstMax <= Math.max(before, RESIDUAL_TOLERANCE * 0.5))) {
    restoreStart(ws, state, u0)
  }
  return { ok: ws.worstMax < RESIDUAL_TOLERANCE, iterations: it + 1, maxScaled: ws.worstMax, worstRow: ws.worstRow }
}

/** Largest √I a starting point may take (I = 25 mol/L): guesses far off must not blow γ up. */
const MAX_START_ROOT_I = 5

/**
 * A few fixed-point passes u ← √I(u) at the starting point; true when the
 * species last computed belong to the state as left. Near u = 0
 * the ionic-strength equation u² − I(u) first falls, so Newton started below
 * its root would step the wrong way; from the fixed point it does not.
 */
function settleIonicStrength(ws: Workspace, state: SolverState): boolean {
  const p = ws.p
  for (let pass = 0; pass < 4; pass++) {
    computeSpecies(ws, state)
    let half = 0
    for (let i = 0; i < p.nsp; i++) half += p.z2[i] * ws.c[i]
    const next = Math.min(Math.sqrt(0.5 * half), MAX_START_ROOT_I)
    // Close enough: keep u, so the species just computed are those of the state.
    if (!Number.isFinite(next) || Math.abs(next - state.u) <= 1e-3 * next) return true
    state.u = next
  }
  return false
}

/**
 * Newton iterations from `state` (updated in place) for the active set in it.
 * Converged when every scaled residual < RESIDUAL_TOLERANCE and the Newton
 * step < STEP_TOLERANCE, or when the residuals have stayed below tolerance for
 * FLOOR_ITERATIONS iterations while rounding keeps the step from shrinking.
 */
export function newton(ws: Workspace, state: SolverState, limits: Limits): NewtonOutcome {
  ws.layout(state)
  // Whether ws holds the species of the current state (saves an evaluation).
  let fresh = ws.hasU ? settleIonicStrength(ws, state) : false
  const nr = ws.nUnknownComponents
  let belowTolerance = 0
  let timedOut = false
  let negativeFor = 0
  ws.worstMax = Infinity
  ws.worstRow = 0
  ws.factors = null
  // Whether the last step was small enough for its factors to stand in for the Jacobian here.
  let chord = false
  let it = 0
  for (; it <= limits.maxIterations; it++) {
    if (!fresh) computeSpecies(ws, state)
    computeResiduals(ws, state, ws.F, ws.scale)
    findWorst(ws)
    if (ws.dim === 0) return { ok: true, iterations: it, maxScaled: 0, worstRow: 0 }
    // Iterations in a row below the tolerance: one above it starts the count again.
    belowTolerance = ws.worstMax < RESIDUAL_TOLERANCE ? belowTolerance + 1 : 0
    if (it === limits.maxIterations) break
    if (performance.now() > limits.deadline) { timedOut = true; break }
    // Converged by the last factors (a chord step): the Newton step here
    // differs from it by a relative CHORD_STEP_LIMIT, far inside the test.
    if (chord && ws.worstMax < RESIDUAL_TOLERANCE && ws.factors && solveWithFactors(ws, ws.factors, ws.factorScale)
      && stepSize(ws, state) < STEP_TOLERANCE) {
      return finalStep(ws, state, it)
    }
    if (!newtonDirection(ws, state)) {
      return {
        ok: false, iterations: it, maxScaled: ws.worstMax, worstRow: ws.worstRow, singular: true,
        reason: `the equations became dependent (singular Jacobian) near ${ws.rowName(ws.worstRow)}`,
      }
    }
    if (ws.worstMax < RESIDUAL_TOLERANCE && (stepSize(ws, state) < STEP_TOLERANCE || belowTolerance >= FLOOR_ITERATIONS)) {
      return finalStep(ws, state, it)
    }
    let cap = 1
    for (let r = 0; r < nr; r++) cap = Math.min(cap, MAX_LOG_STEP / Math.max(Math.abs(ws.delta[r]), 1e-300))
    if (ws.hasU) cap = Math.min(cap, MAX_ROOT_I_STEP / Math.max(Math.abs(ws.delta[nr + ws.nActive]), 1e-300))
    ws.y0.set(state.y)
    ws.n0.set(state.n)
    const u0 = state.u
    const merit0 = meritOf(ws, ws.F, ws.scale)
    // Backtracking on the residuals scaled as at the current point, so an overshoot
    // shows as a larger merit instead of saturating at 1.
    let t = cap
    let descended = false
    for (let k = 0; k < LINE_SEARCH_HALVINGS; k++) {
      state.u = applyStep(ws, state, u0, t)
      computeSpecies(ws, state)
      computeResiduals(ws, state, ws.Ftrial, ws.scaleTrial)
      const merit = meritOf(ws, ws.Ftrial, ws.scale)
      if (merit <= (1 - 2e-4 * t) * merit0 || merit0 < 1e-28) { descended = true; break }
      t *= 0.5
    }
    if (!descended) {
      // No step along the Newton direction lowers the residuals: back to the
      // point before, which either already meets the tolerance (rounding
      // keeps the merit from falling) or is where the solve stalled.
      restoreStart(ws, state, u0)
      if (ws.worstMax < RESIDUAL_TOLERANCE) return { ok: true, iterations: it + 1, maxScaled: ws.worstMax, worstRow: ws.worstRow }
      return {
        ok: false, iterations: it + 1, maxScaled: ws.worstMax, worstRow: ws.worstRow, stalled: true,
        reason: `${ws.rowName(ws.worstRow)} did not close: no step along the Newton direction lowered the residuals (scaled residual ${ws.worstMax.toExponential(2)})`,
      }
    }
    chord = t * stepSize(ws, state) < CHORD_STEP_LIMIT
    fresh = true
    // A solid that stays at a negative amount while the residuals do not
    // close does not belong to the answer: hand it back to the phase loop,
    // which drops it, instead of iterating on an impossible set.
    negativeFor = anyPresentNegative(ws, state) ? negativeFor + 1 : 0
    if (negativeFor >= NEGATIVE_PATIENCE) {
      computeResiduals(ws, state, ws.F, ws.scale)
      findWorst(ws)
      return {
        ok: false, iterations: it + 1, maxScaled: ws.worstMax, worstRow: ws.worstRow, stalled: true,
        reason: `${ws.rowName(ws.worstRow)} did not close with a solid at a negative amount (scaled residual ${ws.worstMax.toExponential(2)})`,
      }
    }
  }
  const stoppedBy = timedOut ? 'the time guard stopped the solve' : `${limits.maxIterations} iterations`
  return {
    ok: false, iterations: Math.min(it, limits.maxIterations), maxScaled: ws.worstMax, worstRow: ws.worstRow, timedOut,
    reason: `${ws.rowName(ws.worstRow)} did not close after ${stoppedBy}: scaled residual ${ws.worstMax.toExponential(2)}`,
  }
}
