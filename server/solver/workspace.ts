/**
 * The solver's state (the unknowns of one solve) and its workspace: scratch
 * arrays sized once per problem and reused by every iteration and every
 * sweep point, so the Newton loop allocates next to nothing.
 */
import { Matrix } from 'ml-matrix'
import { SparseLu } from './sparse-lu'
import { MODE_BALANCE, MODE_TOTAL, type Problem } from './problem'

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
  /** Newton iterations allowed: the budget that decides answers (deterministic). */
  maxIterations: number
  /**
   * performance.now() value after which the solve stops: only an outer guard
   * against runaway work, never reached by a solve that the iteration
   * budget ends; a solve it stops says so in its reason.
   */
  deadline: number
  /** The guard's length in ms, for the message (optional). */
  guardMs?: number
}

export interface NewtonOutcome {
  ok: boolean
  iterations: number
  maxScaled: number
  /** Row of the worst residual (see Workspace.rowName). */
  worstRow: number
  reason?: string
  singular?: boolean
  /** The line search found no step that lowers the residuals. */
  stalled?: boolean
  /** The wall-clock guard (Limits.deadline) stopped the solve, not the equations. */
  timedOut?: boolean
}

/**
 * Jacobian matrices by size, shared by every solve in this thread: a solve
 * runs synchronously to its end, and the LU factors (sparse-lu.ts, factored
 * in place on the matrix's rows) are copied out as they are made, so no two
 * users overlap.
 */
const sharedMatrices = new Map<number, Matrix>()

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
  /** The unknowns at the last computeSpecies, to skip a repeat evaluation. */
  readonly evaluatedY: Float64Array
  evaluatedU = NaN
  /**
   * Most of each present solid that its components' totals allow at any
   * answer (mol/L), by row; Infinity when no component bounds it. Only a
   * component held non-negatively by every species and every solid bounds
   * the solids: then dissolved and precipitated shares are all ≥ 0 at an
   * answer and each solid's share is at most the total. A component held
   * negatively anywhere (H+ beside OH−) can be taken up beyond its total.
   */
  readonly maxAmount: Float64Array
  readonly F: Float64Array
  readonly scale: Float64Array
  readonly Ftrial: Float64Array
  readonly scaleTrial: Float64Array
  readonly delta: Float64Array
  readonly y0: Float64Array
  readonly n0: Float64Array
  /** LU of the scaled Jacobian (sparse-lu.ts), factored in place on the Jacobian's rows. */
  readonly lu = new SparseLu()
  /** `lu` while its factors are those of the last Newton step (for a chord step), with the row scales they were made with. */
  factors: SparseLu | null = null
  /** Right-hand side of a linear solve. */
  readonly rhs: Float64Array
  readonly factorScale: Float64Array
  nUnknownComponents = 0
  nActive = 0
  hasU = false
  dim = 0
  private readonly massNames: string[]
  private readonly chargeNames: string[]
  private readonly solidNames: string[]

  /** Whether component j is held non-negatively by every species and solid (see maxAmount). */
  readonly bounds: Uint8Array

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
    this.evaluatedY = new Float64Array(p.nc)
    this.maxAmount = new Float64Array(p.nsol)
    this.bounds = new Uint8Array(p.nc)
    for (let j = 0; j < p.nc; j++) {
      let nonNegative = true
      for (let i = 0; i < p.nsp; i++) if (p.nu[i * p.nc + j] < 0) nonNegative = false
      for (let t = 0; t < p.nsol; t++) if (p.solidNu[t * p.nc + j] < 0) nonNegative = false
      this.bounds[j] = nonNegative ? 1 : 0
    }
    this.F = new Float64Array(rows)
    this.scale = new Float64Array(rows)
    this.Ftrial = new Float64Array(rows)
    this.scaleTrial = new Float64Array(rows)
    this.delta = new Float64Array(rows)
    this.rhs = new Float64Array(rows)
    this.y0 = new Float64Array(p.nc)
    this.n0 = new Float64Array(p.nsol)
    this.factorScale = new Float64Array(rows)
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
    for (let k = 0; k < a; k++) {
      const s = this.rowSolid[k]
      let most = Infinity
      for (let j = 0; j < p.nc; j++) {
        const v = p.solidNu[s * p.nc + j]
        if (p.mode[j] === MODE_TOTAL && v > 0 && this.bounds[j]) most = Math.min(most, Math.max(p.total[j], 0) / v)
      }
      this.maxAmount[k] = most
    }
    this.hasU = p.activity !== 0 && p.fixedRootI < 0
    this.dim = r + a + (this.hasU ? 1 : 0)
  }

  /** The Jacobian's matrix for this size; its factorisation overwrites it. */
  matrix(dim: number): Matrix {
    let m = sharedMatrices.get(dim)
    if (!m) { m = new Matrix(dim, dim); sharedMatrices.set(dim, m) }
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
