/**
 * LU factorisation in place on the Jacobian's rows (Float64Array per row),
 * using its sparsity. The solver's Jacobian is mostly an arrow: each ligand
 * or metal component couples with itself and a few hubs (the proton, the
 * charge balance, a counter-ion, √I, the present solids). Eliminating the
 * sparse rows and columns first and the hubs last keeps the fill-in inside
 * the hubs' rows and columns, so a factorisation costs about n·h² (h hubs)
 * instead of n³/3.
 *
 * Order: rows and columns are taken symmetrically (row r with unknown r)
 * by increasing count of nonzeros in row r plus column r (a static
 * minimum-degree order), ties by index. Pivots: threshold partial pivoting —
 * the natural pivot is kept when it is at least PIVOT_THRESHOLD times the
 * largest entry below it in its column, else the largest is taken (common
 * practice for sparse LU: stable enough, and it keeps the order's sparsity).
 *
 * The factors are kept as the row operations of L (by original row) and the
 * rows of U (by original column), so a solve costs O(nonzeros of the
 * factors), and one factorisation serves several solves (the chord step).
 */

/** Keep the natural pivot when at least this share of the largest candidate in its column. */
export const PIVOT_THRESHOLD = 0.1

export class SparseLu {
  dim = 0
  /** Original row at pivot position k. */
  rowAt = new Int32Array(0)
  /** Original column (unknown) at pivot position k. */
  colAt = new Int32Array(0)
  /** The pivots U_kk by position. */
  pivots = new Float64Array(0)
  /** L: for pivot k, entries lStart[k] … lStart[k+1]−1 of (lRow, lValue): row lRow −= lValue × pivot row. */
  private lStart = new Int32Array(1)
  private lRow = new Int32Array(64)
  private lValue = new Float64Array(64)
  /** U without its diagonal: for pivot k, (uCol, uValue) of entries right of the pivot. */
  private uStart = new Int32Array(1)
  private uCol = new Int32Array(64)
  private uValue = new Float64Array(64)
  private degree = new Int32Array(0)
  private candidates = new Int32Array(0)
  private cols = new Int32Array(0)
  private work = new Float64Array(0)

  private size(dim: number) {
    if (this.rowAt.length >= dim) { this.dim = dim; return }
    this.rowAt = new Int32Array(dim)
    this.colAt = new Int32Array(dim)
    this.pivots = new Float64Array(dim)
    this.lStart = new Int32Array(dim + 1)
    this.uStart = new Int32Array(dim + 1)
    this.degree = new Int32Array(dim)
    this.candidates = new Int32Array(dim)
    this.cols = new Int32Array(dim)
    this.work = new Float64Array(dim)
    this.dim = dim
  }

  private pushL(at: number, row: number, value: number) {
    if (at === this.lRow.length) {
      const r = new Int32Array(at * 2); r.set(this.lRow); this.lRow = r
      const v = new Float64Array(at * 2); v.set(this.lValue); this.lValue = v
    }
    this.lRow[at] = row
    this.lValue[at] = value
  }

  private pushU(at: number, col: number, value: number) {
    if (at === this.uCol.length) {
      const c = new Int32Array(at * 2); c.set(this.uCol); this.uCol = c
      const v = new Float64Array(at * 2); v.set(this.uValue); this.uValue = v
    }
    this.uCol[at] = col
    this.uValue[at] = value
  }

  /** Factors the dim × dim matrix held in `a` (rows), overwriting it. */
  factor(a: Float64Array[], dim: number): void {
    this.size(dim)
    const { rowAt, colAt, degree, candidates, cols, pivots } = this
    // Symmetric order by nonzeros of row r and column r.
    for (let r = 0; r < dim; r++) degree[r] = 0
    for (let r = 0; r < dim; r++) {
      const row = a[r]
      for (let c = 0; c < dim; c++) if (row[c] !== 0 && c !== r) { degree[r]++; degree[c]++ }
    }
    for (let k = 0; k < dim; k++) rowAt[k] = k
    // Insertion sort by degree, stable (dim is at most a few hundred, and mostly in order already).
    for (let k = 1; k < dim; k++) {
      const v = rowAt[k]
      const d = degree[v]
      let m = k - 1
      while (m >= 0 && degree[rowAt[m]] > d) { rowAt[m + 1] = rowAt[m]; m-- }
      rowAt[m + 1] = v
    }
    colAt.set(rowAt.subarray(0, dim))
    let nl = 0
    let nu = 0
    for (let k = 0; k < dim; k++) {
      this.lStart[k] = nl
      this.uStart[k] = nu
      const pc = colAt[k]
      // Rows below (by position) with an entry in the pivot column, and the largest.
      let nCand = 0
      let biggest = 0
      let biggestAt = -1
      for (let i = k; i < dim; i++) {
        const v = a[rowAt[i]][pc]
        if (v !== 0) {
          candidates[nCand++] = rowAt[i]
          const m = Math.abs(v)
          if (m > biggest) { biggest = m; biggestAt = i }
        }
      }
      if (biggestAt < 0 || !(biggest < Infinity)) {
        // A zero (or not finite) column: singular, the caller sees a zero pivot.
        pivots[k] = biggestAt < 0 ? 0 : Number.NaN
        continue
      }
      if (!(Math.abs(a[rowAt[k]][pc]) >= PIVOT_THRESHOLD * biggest)) {
        const t = rowAt[k]; rowAt[k] = rowAt[biggestAt]; rowAt[biggestAt] = t
      }
      const pr = rowAt[k]
      const prow = a[pr]
      const pivot = prow[pc]
      pivots[k] = pivot
      // The pivot row right of the pivot: U's row k.
      let nCols = 0
      for (let j = k + 1; j < dim; j++) {
        const c = colAt[j]
        const v = prow[c]
        if (v !== 0) { cols[nCols++] = c; this.pushU(nu++, c, v) }
      }
      for (let q = 0; q < nCand; q++) {
        const ri = candidates[q]
        if (ri === pr) continue
        const row = a[ri]
        const l = row[pc] / pivot
        row[pc] = 0
        this.pushL(nl++, ri, l)
        for (let e = 0; e < nCols; e++) { const c = cols[e]; row[c] -= l * prow[c] }
      }
    }
    this.lStart[dim] = nl
    this.uStart[dim] = nu
  }

  /** The smallest and largest |pivot| (NaN in the smallest when a pivot is not finite). */
  pivotRange(): { smallest: number, largest: number } {
    let smallest = Infinity
    let largest = 0
    for (let k = 0; k < this.dim; k++) {
      const m = Math.abs(this.pivots[k])
      if (Number.isNaN(m)) return { smallest: Number.NaN, largest }
      if (m < smallest) smallest = m
      if (m > largest) largest = m
    }
    return { smallest, largest }
  }

  /** x = A⁻¹ b with the last factors (b by row, x by unknown; they may be the same array). */
  solve(b: Float64Array, x: Float64Array): void {
    const dim = this.dim
    const w = this.work
    for (let r = 0; r < dim; r++) w[r] = b[r]
    const { rowAt, colAt, pivots, lStart, lRow, lValue, uStart, uCol, uValue } = this
    for (let k = 0; k < dim; k++) {
      const v = w[rowAt[k]]
      if (v === 0) continue
      for (let e = lStart[k]; e < lStart[k + 1]; e++) w[lRow[e]] -= lValue[e] * v
    }
    for (let k = dim - 1; k >= 0; k--) {
      let s = w[rowAt[k]]
      for (let e = uStart[k]; e < uStart[k + 1]; e++) s -= uValue[e] * x[uCol[e]]
      x[colAt[k]] = s / pivots[k]
    }
  }
}
