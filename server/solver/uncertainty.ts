/**
 * Linear propagation of the constants' uncertainties to one answer. A
 * reaction's log K moves every formation constant it was chained through
 * (`reactionWeights` of the compiled model); the unknowns then move by
 * implicit differentiation of the equations at the answer, J·dz = −∂F/∂θ
 * (the same Jacobian the Newton loop and sensitivity.ts use). Each answer y
 * gets σ_y = sqrt(Σ_r (∂y/∂log K_r · σ_r)²) and the constant whose term is
 * largest.
 */
import { LuDecomposition, Matrix } from 'ml-matrix'
import type { Model } from '../../shared/poise/model'
import type { AnswerUncertainty, Result, UncertaintySummary } from '../../shared/types/result'
import { assembleJacobian, computeResiduals, computeSpecies } from './equations'
import { MODE_BALANCE, MODE_TOTAL } from './problem'
import type { SolverState, Workspace } from './workspace'

/** The reactions that carry a ±: their index in model.reactions and σ of log10 K. */
export function uncertainConstants(model: Model): { index: number; sigma: number }[] {
  const out: { index: number; sigma: number }[] = []
  model.reactions.forEach((r, index) => {
    const sigma = r.logKUncertainty
    if (typeof sigma === 'number' && Number.isFinite(sigma) && sigma > 0) out.push({ index, sigma })
  })
  return out
}

export function uncertaintySummary(model: Model, method: UncertaintySummary['method']): UncertaintySummary {
  return {
    method,
    constants: uncertainConstants(model).map(({ index, sigma }) => ({ reaction: model.reactions[index]!.equation, kind: model.reactions[index]!.kind, logKUncertainty: sigma })),
  }
}

/** Weight of each uncertain reaction (by position in `constants`) in one formation; zeros when none. */
function weightsOf(formation: { reactionWeights?: { reaction: number; weight: number }[] }, position: Map<number, number>, n: number): Float64Array {
  const w = new Float64Array(n)
  for (const { reaction, weight } of formation.reactionWeights ?? []) {
    const k = position.get(reaction)
    if (k !== undefined) w[k] = weight
  }
  return w
}

/**
 * ∂(answer)/∂(log K_r) for every uncertain reaction r at a solved state, in
 * the order of `uncertainConstants(model)`; null when the equations are
 * singular there. Log10 c of the kept species, log10 a of the components,
 * the saturation index of each solid, log10 p of each gas, the dissolved
 * total of each component (mol/L) and the pH.
 */
export interface LogKSensitivities {
  species: Float64Array[]
  solids: Float64Array[]
  gases: Float64Array[]
  dissolved: Float64Array[]
  pH: Float64Array
}

export function logKSensitivities(ws: Workspace, state: SolverState, constants: { index: number }[]): LogKSensitivities | null {
  const p = ws.p
  const m = p.model
  const n = constants.length
  const position = new Map(constants.map((c, k) => [c.index, k]))
  if (m.species.some((s) => s.componentIndex === null && s.reactionWeights === undefined)) return null
  const wSpecies = Array.from({ length: p.nsp }, (_, i) => weightsOf(m.species[p.speciesIndex[i]]!, position, n))
  const wSolids = m.solids.map((s) => weightsOf(s, position, n))
  const wGases = m.gases.map((g) => weightsOf(g, position, n))
  ws.layout(state)
  computeSpecies(ws, state)
  computeResiduals(ws, state, ws.F, ws.scale)
  const dim = ws.dim
  const nr = ws.nUnknownComponents
  const uCol = nr + ws.nActive
  let lu: LuDecomposition | null = null
  if (dim > 0) {
    const J = new Matrix(dim, dim)
    assembleJacobian(ws, state.u, ws.scale, J)
    lu = new LuDecomposition(J)
    if (lu.isSingular()) return null
  }
  const out: LogKSensitivities = {
    species: Array.from({ length: p.nsp }, () => new Float64Array(n)),
    solids: m.solids.map(() => new Float64Array(n)),
    gases: m.gases.map(() => new Float64Array(n)),
    dissolved: m.components.map(() => new Float64Array(n)),
    pH: new Float64Array(n),
  }
  const dx = new Float64Array(p.nc)
  const b = dim > 0 ? new Matrix(dim, 1) : null
  for (let k = 0; k < n; k++) {
    // −∂F/∂θ: a formation constant moves c_i by ln10·c_i·w_ik at fixed unknowns, a solid's saturation by w_sk.
    let du = 0
    dx.fill(0)
    if (b && lu) {
      for (let r = 0; r < dim; r++) b.set(r, 0, 0)
      for (let i = 0; i < p.nsp; i++) {
        const w = wSpecies[i]![k]!
        if (w === 0) continue
        const dc = Math.LN10 * ws.c[i] * w
        for (let r = 0; r < nr; r++) {
          const j = ws.rowComponent[r]
          const coefficient = p.mode[j] === MODE_BALANCE ? p.charge[i] : p.nu[i * p.nc + j]
          if (coefficient !== 0) b.set(r, 0, b.get(r, 0) - (coefficient * dc) / ws.scale[r])
        }
        if (ws.hasU && p.z2[i] !== 0) b.set(uCol, 0, b.get(uCol, 0) + (0.5 * p.z2[i] * dc) / ws.scale[uCol])
      }
      for (let a = 0; a < ws.nActive; a++) {
        const w = wSolids[ws.rowSolid[a]]![k]!
        if (w !== 0) b.set(nr + a, 0, -w / ws.scale[nr + a])
      }
      const dz = lu.solve(b)
      if (ws.hasU) du = dz.get(uCol, 0)
      for (let j = 0; j < p.nc; j++) {
        const r = ws.rowOfComponent[j]
        const unknown = r >= 0 && (p.mode[j] === MODE_TOTAL || p.mode[j] === MODE_BALANCE)
        dx[j] = (unknown ? dz.get(r, 0) : 0) + ws.dxdu[j] * du
      }
    }
    for (let i = 0; i < p.nsp; i++) {
      // d log c_i = w_ik + Σ ν_ij d y_j + (d log c_i/du at fixed y)·du; ws.dlc holds the last term's factor.
      let d = wSpecies[i]![k]! + ws.dlc[i] * du
      for (let e = p.nzStart[i]; e < p.nzStart[i + 1]; e++) {
        const j = p.nzComponent[e]
        d += p.nzNu[e] * (dx[j] - ws.dxdu[j] * du)
      }
      out.species[i]![k] = d
      const dc = Math.LN10 * ws.c[i] * d
      for (let e = p.nzStart[i]; e < p.nzStart[i + 1]; e++) out.dissolved[p.nzComponent[e]]![k] += p.nzNu[e] * dc
    }
    m.solids.forEach((_, s) => {
      let d = wSolids[s]![k]!
      for (let j = 0; j < p.nc; j++) d += p.solidNu[s * p.nc + j] * dx[j]
      out.solids[s]![k] = d
    })
    m.gases.forEach((_, g) => {
      let d = wGases[g]![k]!
      for (let j = 0; j < p.nc; j++) d += p.gasNu[g * p.nc + j] * dx[j]
      out.gases[g]![k] = d
    })
    out.pH[k] = p.hIndex >= 0 ? -dx[p.hIndex] : 0
  }
  return out
}

/** A ± below this share of its value is the arithmetic's rounding, reported as 0. */
const ROUNDING = 1e-9

/** σ and the main contributor from the derivatives over the uncertain constants. */
export function combine(derivatives: ArrayLike<number>, sigmas: readonly number[], reactions: readonly string[]): AnswerUncertainty {
  let total = 0
  let largest = 0
  let main = -1
  for (let k = 0; k < sigmas.length; k++) {
    const term = (derivatives[k]! * sigmas[k]!) ** 2
    total += term
    if (term > largest) { largest = term; main = k }
  }
  const sigma = Math.sqrt(total)
  if (!Number.isFinite(sigma)) return { sigma: 0, main: null }
  return { sigma, main: main >= 0 && total > 0 ? { reaction: reactions[main]!, share: largest / total } : null }
}

/**
 * Adds the ± of every species' log10 c, the pH, each saturation index, each
 * log10 p and each dissolved total to a converged Result of this state,
 * when some constant carries a ±. A note instead when the equations are
 * singular at the answer.
 */
export function attachLinearUncertainty(ws: Workspace, state: SolverState, result: Result): void {
  const m = ws.p.model
  const constants = uncertainConstants(m)
  if (constants.length === 0 || !result.converged) return
  const s = logKSensitivities(ws, state, constants)
  if (!s) {
    result.warnings = [...(result.warnings ?? []), 'No ± could be propagated to this answer: the equations are singular here (or the model was compiled before uncertainties existed).']
    return
  }
  const sigmas = constants.map((c) => c.sigma)
  const names = constants.map((c) => m.reactions[c.index]!.equation)
  const p = ws.p
  for (let i = 0; i < p.nsp; i++) {
    const entry = result.species[i]
    if (entry && entry.log10 !== null) entry.log10Uncertainty = combine(s.species[i]!, sigmas, names)
  }
  m.solids.forEach((_, k) => {
    const entry = result.solids[k]
    if (entry && entry.saturationIndex !== null) entry.saturationIndexUncertainty = combine(s.solids[k]!, sigmas, names)
  })
  m.gases.forEach((_, k) => {
    const entry = result.gases?.[k]
    if (entry && entry.log10 !== null) entry.log10Uncertainty = combine(s.gases[k]!, sigmas, names)
  })
  m.components.forEach((_, j) => {
    const entry = result.components[j]
    if (entry && entry.dissolved !== undefined) {
      const u = combine(s.dissolved[j]!, sigmas, names)
      // A total held by its mass balance moves only by rounding: say 0, not 3e-20.
      entry.dissolvedUncertainty = u.sigma <= ROUNDING * Math.abs(entry.dissolved) ? { sigma: 0, main: null } : u
    }
  })
  const h = p.hIndex
  if (h >= 0 && (p.mode[h] === MODE_TOTAL || p.mode[h] === MODE_BALANCE)) result.pHUncertainty = combine(s.pH, sigmas, names)
  result.uncertainty = uncertaintySummary(m, 'linear')
}
