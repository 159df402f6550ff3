/**
 * The equations in closed form: species from the unknowns, the residuals of
 * the mass, charge and ionic-strength balances and the saturation of present
 * solids, and their Jacobian.
 */
import type { Matrix } from 'ml-matrix'
import { ACTIVITY_DEBYE_HUCKEL, dLogGammaDu, logGamma } from './activity'
import { MODE_BALANCE, MODE_FIXED_CONCENTRATION, MODE_TOTAL } from './problem'
import type { SolverState, Workspace } from './workspace'

/** log10 c is clamped here so an overshooting guess gives a huge residual, never Infinity. */
const MAX_LOG_CONCENTRATION = 300

/**
 * From (y, u): the activities x of every component, then log10 c, c and
 * log10 γ of every species, and d log10 c/du at fixed unknowns.
 */
export function computeSpecies(ws: Workspace, state: SolverState): void {
  const p = ws.p
  const { nc, nsp, logK } = p
  const x = state.x
  ws.evaluatedY.set(state.y)
  ws.evaluatedU = state.u
  const uu = p.fixedRootI >= 0 ? p.fixedRootI : state.u
  if (p.activity === ACTIVITY_DEBYE_HUCKEL) {
    for (let i = 0; i < nsp; i++) {
      const ba = p.B * p.ionSize[i]
      ws.g[i] = logGamma(p.activity, p.A, ba, p.z2[i], uu)
      ws.dlc[i] = -dLogGammaDu(p.activity, p.A, ba, p.z2[i], uu)
    }
  } else {
    // Davies and ideal: log10 γ is z² times one function of u, evaluated once.
    const perZ2 = logGamma(p.activity, p.A, 0, 1, uu)
    const dPerZ2 = -dLogGammaDu(p.activity, p.A, 0, 1, uu)
    for (let i = 0; i < nsp; i++) {
      ws.g[i] = p.z2[i] * perZ2
      ws.dlc[i] = p.z2[i] * dPerZ2
    }
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

/** Whether the species in ws were computed at this state (same unknowns, same problem since). */
export function speciesAreOf(ws: Workspace, state: SolverState): boolean {
  if (ws.evaluatedU !== state.u) return false
  for (let j = 0; j < state.y.length; j++) if (ws.evaluatedY[j] !== state.y[j]) return false
  return true
}

/** Residuals F and their natural scales at the species last computed, for the current layout. */
export function computeResiduals(ws: Workspace, state: SolverState, F: Float64Array, scale: Float64Array): void {
  const { x, n, u } = state
  const p = ws.p
  const { nc, nsp, charge, z2, colStart, colSpecies, colNu } = p
  const c = ws.c
  const nr = ws.nUnknownComponents
  for (let r = 0; r < nr; r++) {
    const j = ws.rowComponent[r]
    let sum = 0
    let mag = 0
    if (p.mode[j] === MODE_BALANCE) {
      for (let i = 0; i < nsp; i++) { const q = charge[i] * c[i]; sum += q; mag += Math.abs(q) }
    } else {
      for (let e = colStart[j]; e < colStart[j + 1]; e++) { const q = colNu[e] * c[colSpecies[e]]; sum += q; mag += Math.abs(q) }
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
export function assembleJacobian(ws: Workspace, u: number, scale: Float64Array, J: Matrix): void {
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
