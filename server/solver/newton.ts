/**
 * Damped Newton–Raphson for one active set of solids. Unknowns: log10 of the
 * free concentration of the components under a mass or charge balance (their
 * log10 activity follows with γ), the amounts of the present solids, and
 * u = √I when the activity model needs it, so ionic strength is solved with
 * everything else instead of iterated around it. Concentrations rather than
 * activities as unknowns keep the free forms still while u moves, which is
 * what makes the joint Newton step safe at high ionic strength.
 */
import { LuDecomposition, Matrix } from 'ml-matrix'
import { dLogGammaDu, logGamma } from './activity'
import {
  MODE_BALANCE, MODE_FIXED_CONCENTRATION, MODE_TOTAL, type Problem,
} from './problem'

/** Every scaled residual must fall below this. */
export const RESIDUAL_TOLERANCE = 1e-10
/** And the last Newton step below this, in log10 units. */
export const STEP_TOLERANCE = 1e-12
/** Largest change of any log10 a in one iteration. */
const MAX_LOG_STEP = 1.5
/** Largest change of √I in one iteration. */
const MAX_ROOT_I_STEP = 0.5
/** Iterations spent below the residual tolerance without the step shrinking: the rounding floor. */
const FLOOR_ITERATIONS = 3
/** log10 c is clamped here so an overshooting guess gives a huge residual, never Infinity. */
const MAX_LOG_CONCENTRATION = 300

export interface SolverState {
  /** log10 free concentration of the components under a balance (the unknowns). */
  y: Float64Array
  /** log10 activity of every component, derived by computeSpecies. */
  x: Float64Array
  /** mol/L of each solid (0 when absent). */
  n: Float64Array
  active: Uint8Array
  /** √I, mol^½ L^−½. */
  u: number
}

export interface Limits {
  maxIterations: number
  /** performance.now() value after which the solve gives up. */
  deadline: number
}

export interface NewtonOutcome {
  ok: boolean
  iterations: number
  maxScaled: number
  /** Row of the worst residual (see Workspace.rowName). */
  worstRow: number
  reason?: string
  singular?: boolean
}

/** Scratch arrays sized once per problem, reused by every iteration and every sweep point. */
export class Workspace {
  readonly lc: Float64Array
  readonly c: Float64Array
  readonly g: Float64Array
  /** d log10 c_i / du at fixed unknowns. */
  readonly dlc: Float64Array
  /** d log10 a_j / du of each fixed-concentration component. */
  readonly dxdu: Float64Array
  readonly rowComponent: Int32Array
  /** Row (= column) of each component among the unknowns, or −1. */
  readonly rowOfComponent: Int32Array
  balanceRow = -1
  worstMax = 0
  worstRow = 0
  readonly rowSolid: Int32Array
  readonly F: Float64Array
  readonly scale: Float64Array
  readonly Ftrial: Float64Array
  readonly scaleTrial: Float64Array
  readonly delta: Float64Array
  readonly y0: Float64Array
  readonly n0: Float64Array
  nUnknownComponents = 0
  nActive = 0
  hasU = false
  dim = 0
  private readonly massNames: string[]
  private readonly chargeNames: string[]
  private readonly solidNames: string[]
  private readonly matrices = new Map<number, Matrix>()
  private readonly rhs = new Map<number, Matrix>()

  constructor(readonly p: Problem) {
    const rows = p.nc + p.nsol + 1
    this.lc = new Float64Array(p.nsp)
    this.c = new Float64Array(p.nsp)
    this.g = new Float64Array(p.nsp)
    this.dlc = new Float64Array(p.nsp)
    this.dxdu = new Float64Array(p.nc)
    this.rowComponent = new Int32Array(p.nc)
    this.rowOfComponent = new Int32Array(p.nc)
    this.rowSolid = new Int32Array(p.nsol)
    this.F = new Float64Array(rows)
    this.scale = new Float64Array(rows)
    this.Ftrial = new Float64Array(rows)
    this.scaleTrial = new Float64Array(rows)
    this.delta = new Float64Array(rows)
    this.y0 = new Float64Array(p.nc)
    this.n0 = new Float64Array(p.nsol)
    this.massNames = p.model.components.map((c) => `the mass balance of ${c.name}`)
    this.chargeNames = p.model.components.map((c) => `the charge balance (solved for ${c.name})`)
    this.solidNames = p.model.solids.map((s) => `the saturation of ${s.name}`)
  }

  /** Lays out the rows for the present solids. */
  layout(state: SolverState): void {
    const p = this.p
    let r = 0
    this.balanceRow = -1
    for (let j = 0; j < p.nc; j++) {
      this.rowOfComponent[j] = -1
      if (p.mode[j] === MODE_TOTAL || p.mode[j] === MODE_BALANCE) {
        if (p.mode[j] === MODE_BALANCE) this.balanceRow = r
        this.rowOfComponent[j] = r
        this.rowComponent[r++] = j
      }
    }
    this.nUnknownComponents = r
    let a = 0
    for (let s = 0; s < p.nsol; s++) if (state.active[s]) this.rowSolid[a++] = s
    this.nActive = a
    this.hasU = p.activity !== 0 && p.fixedRootI < 0
    this.dim = r + a + (this.hasU ? 1 : 0)
  }

  matrix(dim: number): Matrix {
    let m = this.matrices.get(dim)
    if (!m) { m = new Matrix(dim, dim); this.matrices.set(dim, m) }
    return m
  }

  column(dim: number): Matrix {
    let m = this.rhs.get(dim)
    if (!m) { m = new Matrix(dim, 1); this.rhs.set(dim, m) }
    return m
  }

  /** Plain words for an equation row. */
  rowName(row: number): string {
    const p = this.p
    if (row < this.nUnknownComponents) {
      const j = this.rowComponent[row]
      return p.mode[j] === MODE_BALANCE ? this.chargeNames[j] : this.massNames[j]
    }
    if (row < this.nUnknownComponents + this.nActive) return this.solidNames[this.rowSolid[row - this.nUnknownComponents]]
    return 'the ionic strength'
  }
}

/**
 * From (y, u): the activities x of every component, then log10 c, c and
 * log10 γ of every species, and d log10 c/du at fixed unknowns.
 */
export function computeSpecies(ws: Workspace, state: SolverState): void {
  const p = ws.p
  const { nc, nsp, logK } = p
  const x = state.x
  const uu = p.fixedRootI >= 0 ? p.fixedRootI : state.u
  for (let i = 0; i < nsp; i++) {
    const ba = p.B * p.ionSize[i]
    ws.g[i] = logGamma(p.activity, p.A, ba, p.z2[i], uu)
    ws.dlc[i] = -dLogGammaDu(p.activity, p.A, ba, p.z2[i], uu)
  }
  // Components known or solved by concentration have log10 a_j = log10 c_j +
  // log10 γ_j(u); dxdu carries that dependence into the Jacobian.
  const dxdu = ws.dxdu
  for (let j = 0; j < nc; j++) {
    dxdu[j] = 0
    const m = p.mode[j]
    const k = p.componentSpecies[j]
    const byConcentration = m === MODE_TOTAL || m === MODE_BALANCE || m === MODE_FIXED_CONCENTRATION
    x[j] = m === MODE_TOTAL || m === MODE_BALANCE ? state.y[j] : p.fixedLog[j]
    if (byConcentration && k >= 0) {
      x[j] += ws.g[k]
      dxdu[j] = -ws.dlc[k]
    }
  }
  const { nzStart, nzComponent, nzNu } = p
  for (let i = 0; i < nsp; i++) {
    let l = logK[i] - ws.g[i]
    let d = ws.dlc[i]
    for (let e = nzStart[i]; e < nzStart[i + 1]; e++) {
      const j = nzComponent[e]
      const v = nzNu[e]
      l += v * x[j]
      d += v * dxdu[j]
    }
    if (l > MAX_LOG_CONCENTRATION) l = MAX_LOG_CONCENTRATION
    ws.lc[i] = l
    ws.c[i] = Math.exp(l * Math.LN10)
    ws.dlc[i] = d
  }
}

/** Residuals F and their natural scales at the species last computed, for the current layout. */
export function computeResiduals(ws: Workspace, state: SolverState, F: Float64Array, scale: Float64Array): void {
  const { x, n, u } = state
  const p = ws.p
  const { nc, nsp, nu, charge, z2 } = p
  const c = ws.c
  const nr = ws.nUnknownComponents
  for (let r = 0; r < nr; r++) {
    const j = ws.rowComponent[r]
    let sum = 0
    let mag = 0
    if (p.mode[j] === MODE_BALANCE) {
      for (let i = 0; i < nsp; i++) { const q = charge[i] * c[i]; sum += q; mag += Math.abs(q) }
    } else {
      for (let i = 0; i < nsp; i++) {
        const v = nu[i * nc + j]
        if (v !== 0) { const q = v * c[i]; sum += q; mag += Math.abs(q) }
      }
      for (let a = 0; a < ws.nActive; a++) {
        const s = ws.rowSolid[a]
        const q = p.solidNu[s * nc + j] * n[s]
        sum += q; mag += Math.abs(q)
      }
      sum -= p.total[j]
      mag = Math.max(mag, Math.abs(p.total[j]))
    }
    F[r] = sum
    scale[r] = mag > 0 ? mag : 1e-300
  }
  for (let a = 0; a < ws.nActive; a++) {
    const s = ws.rowSolid[a]
    let si = p.solidLogK[s]
    for (let j = 0; j < nc; j++) si += p.solidNu[s * nc + j] * x[j]
    F[nr + a] = si
    scale[nr + a] = 1
  }
  if (ws.hasU) {
    let half = 0
    for (let i = 0; i < nsp; i++) half += z2[i] * c[i]
    half *= 0.5
    const row = nr + ws.nActive
    F[row] = u * u - half
    const mag = Math.max(u * u, half)
    scale[row] = mag > 0 ? mag : 1e-300
  }
}

/** The Jacobian of F over the unknowns, each row divided by scale, into J. */
function assembleJacobian(ws: Workspace, u: number, scale: Float64Array, J: Matrix): void {
  const p = ws.p
  const { nc, nsp, charge, z2 } = p
  const nr = ws.nUnknownComponents
  const na = ws.nActive
  const dim = ws.dim
  const uCol = nr + na
  const data = (J as unknown as { data: Float64Array[] }).data
  for (let r = 0; r < dim; r++) data[r].fill(0)
  const { nzStart, nzComponent, nzNu } = p
  const rowOf = ws.rowOfComponent
  const balanceRow = ws.balanceRow
  for (let i = 0; i < nsp; i++) {
    const w = Math.LN10 * ws.c[i]
    if (w === 0) continue
    const start = nzStart[i]
    const end = nzStart[i + 1]
    const dl = ws.dlc[i]
    // Mass-balance rows: w ν_ij ν_ik over the species' own components.
    for (let e = start; e < end; e++) {
      const r = rowOf[nzComponent[e]]
      if (r < 0 || r === balanceRow) continue
      const row = data[r]
      const wr = w * nzNu[e]
      for (let f = start; f < end; f++) {
        const k = rowOf[nzComponent[f]]
        if (k >= 0) row[k] += wr * nzNu[f]
      }
      if (ws.hasU) row[uCol] += wr * dl
    }
    if (balanceRow >= 0 && charge[i] !== 0) {
      const row = data[balanceRow]
      const wr = w * charge[i]
      for (let f = start; f < end; f++) {
        const k = rowOf[nzComponent[f]]
        if (k >= 0) row[k] += wr * nzNu[f]
      }
      if (ws.hasU) row[uCol] += wr * dl
    }
    if (ws.hasU && z2[i] !== 0) {
      const row = data[uCol]
      const wr = -0.5 * w * z2[i]
      for (let f = start; f < end; f++) {
        const k = rowOf[nzComponent[f]]
        if (k >= 0) row[k] += wr * nzNu[f]
      }
      row[uCol] += wr * dl
    }
  }
  for (let a = 0; a < na; a++) {
    const s = ws.rowSolid[a]
    for (let r = 0; r < nr; r++) {
      const j = ws.rowComponent[r]
      if (p.mode[j] === MODE_TOTAL) data[r][nr + a] = p.solidNu[s * nc + j]
    }
    const row = data[nr + a]
    for (let k = 0; k < nr; k++) row[k] = p.solidNu[s * nc + ws.rowComponent[k]]
    if (ws.hasU) {
      let d = 0
      for (let j = 0; j < nc; j++) d += p.solidNu[s * nc + j] * ws.dxdu[j]
      row[uCol] = d
    }
  }
  if (ws.hasU) data[uCol][uCol] += 2 * u
  for (let r = 0; r < dim; r++) {
    const inv = 1 / scale[r]
    const row = data[r]
    for (let k = 0; k < dim; k++) row[k] *= inv
  }
}

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
  for (let a = 0; a < ws.nActive; a++) { const s = ws.rowSolid[a]; state.n[s] = ws.n0[s] + t * ws.delta[nr + a] }
  // √I may shrink tenfold at most in one step: it must stay positive.
  return ws.hasU ? Math.max(0.1 * u0, u0 + t * ws.delta[nr + ws.nActive]) : u0
}

/**
 * Solves J·delta = −F/scale; false when J is singular. Without solids a
 * singular J only means one species swamps the others (rows in proportion),
 * so a small diagonal shift (Levenberg–Marquardt) still gives a descent
 * direction; with solids it is reported, because it means dependent
 * saturation equations, which the phase loop resolves.
 */
function newtonDirection(ws: Workspace, state: SolverState): boolean {
  const dim = ws.dim
  const J = ws.matrix(dim)
  assembleJacobian(ws, state.u, ws.scale, J)
  const b = ws.column(dim)
  for (let r = 0; r < dim; r++) b.set(r, 0, -ws.F[r] / ws.scale[r])
  let lu = new LuDecomposition(J)
  if (lu.isSingular()) {
    if (ws.nActive > 0) return false
    let biggest = 0
    for (let r = 0; r < dim; r++) for (let k = 0; k < dim; k++) biggest = Math.max(biggest, Math.abs(J.get(r, k)))
    const shift = Math.max(biggest, 1) * 1e-8
    for (let r = 0; r < dim; r++) J.set(r, r, J.get(r, r) + shift)
    lu = new LuDecomposition(J)
    if (lu.isSingular()) return false
  }
  const sol = lu.solve(b)
  for (let r = 0; r < dim; r++) {
    const v = sol.get(r, 0)
    if (!Number.isFinite(v)) return false
    ws.delta[r] = v
  }
  return true
}

/** Passes of the starting-point correction below. */
const PRESOLVE_PASSES = 12

/**
 * Brings a cold guess near the balances before Newton: each total
 * component held only positively is scaled by (T / Σ ν c)^(1/ν_max), and the
 * balance component takes a clipped step on the charge balance, a few passes. A guess of every free form at its total can put a strong complex
 * at 10^20 mol/L, where the Jacobian rows become proportional; after this no
 * species exceeds the totals that make it.
 */
export function presolve(ws: Workspace, state: SolverState): void {
  const p = ws.p
  const { nc, nsp, nu } = p
  for (let pass = 0; pass < PRESOLVE_PASSES; pass++) {
    computeSpecies(ws, state)
    let moved = false
    for (let j = 0; j < nc; j++) {
      if (p.mode[j] !== MODE_TOTAL || !(p.total[j] > 0)) continue
      let sum = 0
      let nuMax = 0
      let positive = true
      for (let i = 0; i < nsp; i++) {
        const v = nu[i * nc + j]
        if (v < 0) { positive = false; break }
        if (v > 0) { sum += v * ws.c[i]; nuMax = Math.max(nuMax, v) }
      }
      if (!positive || nuMax === 0 || !(sum > 0) || !Number.isFinite(sum)) continue
      const change = Math.log10(p.total[j] / sum) / nuMax
      if (Math.abs(change) > 0.01) moved = true
      state.y[j] += Math.max(-MAX_PRESOLVE_STEP, Math.min(MAX_PRESOLVE_STEP, change))
    }
    if (balanceStep(ws, state)) moved = true
    if (!moved) break
  }
}

/**
 * One clipped Newton step of the charge balance alone on the balance
 * component (the others held), at the species last computed; true when it
 * moved noticeably.
 */
function balanceStep(ws: Workspace, state: SolverState): boolean {
  const p = ws.p
  const { nc, nsp, nu, charge } = p
  for (let j = 0; j < nc; j++) {
    if (p.mode[j] !== MODE_BALANCE) continue
    let F = 0
    let dF = 0
    for (let i = 0; i < nsp; i++) {
      const q = charge[i] * ws.c[i]
      F += q
      dF += Math.LN10 * q * nu[i * nc + j]
    }
    if (!(dF !== 0) || !Number.isFinite(F / dF)) return false
    const step = Math.max(-MAX_BALANCE_PRESTEP, Math.min(MAX_BALANCE_PRESTEP, -F / dF))
    state.y[j] += step
    return Math.abs(step) > 0.01
  }
  return false
}

/** Largest change of the balance component in one presolve pass. */
const MAX_BALANCE_PRESTEP = 2

/** Largest change of one log10 c in one presolve pass. */
const MAX_PRESOLVE_STEP = 10

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
  ws.worstMax = Infinity
  ws.worstRow = 0
  for (let it = 0; it <= limits.maxIterations; it++) {
    if (!fresh) computeSpecies(ws, state)
    computeResiduals(ws, state, ws.F, ws.scale)
    findWorst(ws)
    if (ws.dim === 0) return { ok: true, iterations: it, maxScaled: 0, worstRow: 0 }
    if (ws.worstMax < RESIDUAL_TOLERANCE) belowTolerance++
    if (it === limits.maxIterations || performance.now() > limits.deadline) break
    if (!newtonDirection(ws, state)) {
      return {
        ok: false, iterations: it, maxScaled: ws.worstMax, worstRow: ws.worstRow, singular: true,
        reason: `the equations became dependent (singular Jacobian) near ${ws.rowName(ws.worstRow)}`,
      }
    }
    if (ws.worstMax < RESIDUAL_TOLERANCE && (stepSize(ws, state) < STEP_TOLERANCE || belowTolerance >= FLOOR_ITERATIONS)) {
      // Take the last, tiny step too: it brings the answer to rounding level.
      ws.y0.set(state.y)
      ws.n0.set(state.n)
      state.u = applyStep(ws, state, state.u, 1)
      computeSpecies(ws, state)
      return { ok: true, iterations: it + 1, maxScaled: ws.worstMax, worstRow: ws.worstRow }
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
    for (let k = 0; k < 40; k++) {
      state.u = applyStep(ws, state, u0, t)
      computeSpecies(ws, state)
      computeResiduals(ws, state, ws.Ftrial, ws.scaleTrial)
      const merit = meritOf(ws, ws.Ftrial, ws.scale)
      if (merit <= (1 - 2e-4 * t) * merit0 || merit0 < 1e-28) break
      t *= 0.5
    }
    fresh = true
  }
  const stoppedBy = performance.now() > limits.deadline ? 'the time limit ran out' : `${limits.maxIterations} iterations`
  return {
    ok: false, iterations: limits.maxIterations, maxScaled: ws.worstMax, worstRow: ws.worstRow,
    reason: `${ws.rowName(ws.worstRow)} did not close after ${stoppedBy}: scaled residual ${ws.worstMax.toExponential(2)}`,
  }
}
