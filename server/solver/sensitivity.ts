/**
 * Sensitivities at an answer: how log10 a(H+) moves when a total or the
 * charge balance moves, from the Jacobian of the equations at the solved
 * state (implicit differentiation: J·dz = −∂F/∂θ). Buffer capacity and the
 * slope of a titration curve come from here, not from differences of
 * neighbouring points.
 */
import { LuDecomposition, Matrix } from 'ml-matrix'
import { assembleJacobian, computeResiduals, computeSpecies } from './equations'
import { MODE_BALANCE, MODE_TOTAL } from './problem'
import type { SolverState, Workspace } from './workspace'

/**
 * d log10 a(H+) / dθ at a solved state, where θ moves the residual of each
 * mass balance j by dTotalRow[j] (∂F_j/∂θ) and the charge balance by
 * dCharge. Null when H+ is not solved for (held or absent) or the equations
 * are singular there.
 */
export function dLogActivityH(ws: Workspace, state: SolverState, dTotalRow: ArrayLike<number>, dCharge: number): number | null {
  const p = ws.p
  const h = p.hIndex
  if (h < 0 || (p.mode[h] !== MODE_TOTAL && p.mode[h] !== MODE_BALANCE)) return null
  ws.layout(state)
  computeSpecies(ws, state)
  computeResiduals(ws, state, ws.F, ws.scale)
  const dim = ws.dim
  if (dim === 0) return null
  const J = new Matrix(dim, dim)
  assembleJacobian(ws, state.u, ws.scale, J)
  const b = new Matrix(dim, 1)
  for (let r = 0; r < ws.nUnknownComponents; r++) {
    const j = ws.rowComponent[r]
    const d = p.mode[j] === MODE_BALANCE ? dCharge : dTotalRow[j]
    b.set(r, 0, -d / ws.scale[r])
  }
  const lu = new LuDecomposition(J)
  if (lu.isSingular()) return null
  const dz = lu.solve(b)
  let d = dz.get(ws.rowOfComponent[h], 0)
  if (ws.hasU && p.componentSpecies[h] >= 0) d += ws.dxdu[h] * dz.get(ws.nUnknownComponents + ws.nActive, 0)
  return Number.isFinite(d) ? d : null
}

/**
 * β = dC(base)/dpH, mol/L per pH unit: a strong monovalent base δ lowers
 * the proton total by δ and adds δ of positive charge (its spectator
 * cation). Null when the pH does not move with it (a solid or a held
 * activity fixes it) or cannot be computed.
 */
export function bufferCapacity(ws: Workspace, state: SolverState): number | null {
  const p = ws.p
  if (p.hIndex < 0) return null
  const rows = new Float64Array(p.nc)
  rows[p.hIndex] = 1 // F_H = Σν·c − (T_H − δ)
  const d = dLogActivityH(ws, state, rows, 1)
  if (d === null || !(d < 0)) return null
  const beta = -1 / d
  return Number.isFinite(beta) ? beta : null
}
