/**
 * The reference for `ratioToPlain`: the solver's Newton step written the
 * plainest fast way, straight loops over Float64Array with Gaussian
 * elimination (partial pivoting) in place. Same equations, same unknowns
 * (log10 free concentrations, amounts of present solids, √I), same
 * sequence of evaluations as one iteration of server/solver/newton.ts.
 */
import type { Problem } from '../server/solver/problem'

const LN10 = Math.LN10

export class PlainNewtonStep {
  readonly c: Float64Array
  readonly g: Float64Array
  readonly dg: Float64Array
  readonly x: Float64Array
  readonly dxdu: Float64Array
  readonly dlc: Float64Array
  readonly F: Float64Array
  readonly scale: Float64Array
  readonly J: Float64Array
  readonly delta: Float64Array
  readonly rows: Int32Array
  readonly solids: Int32Array
  readonly colOf: Int32Array
  nr = 0
  na = 0
  dim = 0

  constructor(readonly p: Problem) {
    const n = p.nc + p.nsol + 1
    this.c = new Float64Array(p.nsp); this.g = new Float64Array(p.nsp); this.dg = new Float64Array(p.nsp)
    this.dlc = new Float64Array(p.nsp); this.x = new Float64Array(p.nc); this.dxdu = new Float64Array(p.nc)
    this.F = new Float64Array(n); this.scale = new Float64Array(n); this.J = new Float64Array(n * n)
    this.delta = new Float64Array(n); this.rows = new Int32Array(p.nc); this.solids = new Int32Array(p.nsol)
    this.colOf = new Int32Array(p.nc)
  }

  layout(active: Uint8Array): void {
    const p = this.p
    this.nr = 0
    for (let j = 0; j < p.nc; j++) {
      this.colOf[j] = p.mode[j] <= 1 ? this.nr : -1
      if (p.mode[j] <= 1) this.rows[this.nr++] = j
    }
    this.na = 0
    for (let s = 0; s < p.nsol; s++) if (active[s]) this.solids[this.na++] = s
    this.dim = this.nr + this.na + 1
  }

  /** Davies γ at √I = u, then x, c and d log c/du. */
  species(y: Float64Array, u: number): void {
    const p = this.p
    const A = p.A
    for (let i = 0; i < p.nsp; i++) {
      const z2 = p.z2[i]
      this.g[i] = -A * z2 * (u / (1 + u) - 0.3 * u * u)
      this.dg[i] = -A * z2 * (1 / ((1 + u) * (1 + u)) - 0.6 * u)
    }
    for (let j = 0; j < p.nc; j++) {
      const k = p.componentSpecies[j]
      const m = p.mode[j]
      this.x[j] = m <= 1 ? y[j] : p.fixedLog[j]
      this.dxdu[j] = 0
      if (m <= 2 && k >= 0) { this.x[j] += this.g[k]; this.dxdu[j] = this.dg[k] }
    }
    for (let i = 0; i < p.nsp; i++) {
      let l = p.logK[i] - this.g[i]
      let d = -this.dg[i]
      for (let e = p.nzStart[i]; e < p.nzStart[i + 1]; e++) {
        const j = p.nzComponent[e]
        l += p.nzNu[e] * this.x[j]
        d += p.nzNu[e] * this.dxdu[j]
      }
      this.c[i] = Math.exp(Math.min(l, 300) * LN10)
      this.dlc[i] = d
    }
  }

  residuals(n: Float64Array, u: number): void {
    const p = this.p
    for (let r = 0; r < this.nr; r++) {
      const j = this.rows[r]
      let sum = 0
      let mag = 0
      if (p.mode[j] === 1) {
        for (let i = 0; i < p.nsp; i++) { const q = p.charge[i] * this.c[i]; sum += q; mag += Math.abs(q) }
      } else {
        for (let i = 0; i < p.nsp; i++) { const q = p.nu[i * p.nc + j] * this.c[i]; sum += q; mag += Math.abs(q) }
        for (let a = 0; a < this.na; a++) { const q = p.solidNu[this.solids[a] * p.nc + j] * n[this.solids[a]]; sum += q; mag += Math.abs(q) }
        sum -= p.total[j]
        mag = Math.max(mag, Math.abs(p.total[j]))
      }
      this.F[r] = sum
      this.scale[r] = mag || 1e-300
    }
    for (let a = 0; a < this.na; a++) {
      const s = this.solids[a]
      let si = p.solidLogK[s]
      for (let j = 0; j < p.nc; j++) si += p.solidNu[s * p.nc + j] * this.x[j]
      this.F[this.nr + a] = si
      this.scale[this.nr + a] = 1
    }
    let half = 0
    for (let i = 0; i < p.nsp; i++) half += p.z2[i] * this.c[i]
    half *= 0.5
    this.F[this.dim - 1] = u * u - half
    this.scale[this.dim - 1] = Math.max(u * u, half) || 1e-300
  }

  jacobian(u: number): void {
    const p = this.p
    const { dim, nr, na, J } = this
    const uc = nr + na
    J.fill(0)
    const col = this.colOf
    for (let i = 0; i < p.nsp; i++) {
      const w = LN10 * this.c[i]
      const e0 = p.nzStart[i]
      const e1 = p.nzStart[i + 1]
      for (let r = 0; r < nr; r++) {
        const j = this.rows[r]
        let rc = 0
        if (p.mode[j] === 1) rc = p.charge[i]
        else for (let e = e0; e < e1; e++) if (p.nzComponent[e] === j) rc = p.nzNu[e]
        if (rc === 0) continue
        for (let e = e0; e < e1; e++) { const k = col[p.nzComponent[e]]; if (k >= 0) J[r * dim + k] += w * rc * p.nzNu[e] }
        J[r * dim + uc] += w * rc * this.dlc[i]
      }
      const h = -0.5 * w * p.z2[i]
      for (let e = e0; e < e1; e++) { const k = col[p.nzComponent[e]]; if (k >= 0) J[uc * dim + k] += h * p.nzNu[e] }
      J[uc * dim + uc] += h * this.dlc[i]
    }
    for (let a = 0; a < na; a++) {
      const s = this.solids[a]
      for (let r = 0; r < nr; r++) {
        const j = this.rows[r]
        if (p.mode[j] === 0) J[r * dim + nr + a] = p.solidNu[s * p.nc + j]
        J[(nr + a) * dim + r] = p.solidNu[s * p.nc + j]
      }
      let d = 0
      for (let j = 0; j < p.nc; j++) d += p.solidNu[s * p.nc + j] * this.dxdu[j]
      J[(nr + a) * dim + uc] = d
    }
    J[uc * dim + uc] += 2 * u
    for (let r = 0; r < dim; r++) for (let k = 0; k < dim; k++) J[r * dim + k] /= this.scale[r]
  }

  /** Gaussian elimination with partial pivoting on J·delta = −F/scale. */
  solveLinear(): void {
    const { dim, J, delta } = this
    for (let r = 0; r < dim; r++) delta[r] = -this.F[r] / this.scale[r]
    for (let col = 0; col < dim; col++) {
      let piv = col
      for (let r = col + 1; r < dim; r++) if (Math.abs(J[r * dim + col]) > Math.abs(J[piv * dim + col])) piv = r
      if (piv !== col) {
        for (let k = 0; k < dim; k++) { const t = J[col * dim + k]; J[col * dim + k] = J[piv * dim + k]; J[piv * dim + k] = t }
        const t = delta[col]; delta[col] = delta[piv]; delta[piv] = t
      }
      const d = J[col * dim + col]
      for (let r = col + 1; r < dim; r++) {
        const f = J[r * dim + col] / d
        if (f === 0) continue
        for (let k = col; k < dim; k++) J[r * dim + k] -= f * J[col * dim + k]
        delta[r] -= f * delta[col]
      }
    }
    for (let r = dim - 1; r >= 0; r--) {
      let s = delta[r]
      for (let k = r + 1; k < dim; k++) s -= J[r * dim + k] * delta[k]
      delta[r] = s / J[r * dim + r]
    }
  }

  /**
   * One iteration as the solver does it: settle √I (same rule), evaluate
   * unless the settling pass already did, Jacobian, solve, evaluate the full
   * step, then the residuals at the new point.
   */
  step(y: Float64Array, n: Float64Array, u: number, active: Uint8Array): void {
    this.layout(active)
    let fresh = false
    for (let k = 0; k < 4; k++) {
      this.species(y, u)
      let half = 0
      for (let i = 0; i < this.p.nsp; i++) half += this.p.z2[i] * this.c[i]
      const next = Math.min(Math.sqrt(0.5 * half), 5)
      if (Math.abs(next - u) <= 1e-3 * next) { fresh = true; break }
      u = next
    }
    if (!fresh) this.species(y, u)
    this.residuals(n, u)
    this.jacobian(u)
    this.solveLinear()
    for (let r = 0; r < this.nr; r++) y[this.rows[r]] += this.delta[r]
    for (let a = 0; a < this.na; a++) n[this.solids[a]] += this.delta[this.nr + a]
    u += this.delta[this.dim - 1]
    this.species(y, u)
    this.residuals(n, u)
    this.residuals(n, u)
  }
}
