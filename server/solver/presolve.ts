/**
 * Cold starts: a cheap correction of the first guess before Newton.
 */
import { computeSpecies } from './equations'
import { MODE_BALANCE, MODE_TOTAL } from './problem'
import type { SolverState, Workspace } from './workspace'

/** Passes of the starting-point correction below. */
const PRESOLVE_PASSES = 30

/**
 * Brings a cold guess near the balances before Newton: each total
 * component held only positively is scaled by (T / Σ ν c)^(1/ν_max), and the
 * balance component takes a clipped step on the charge balance, a few passes. A guess of every free form at its total can put a strong complex
 * at 10^20 mol/L, where the Jacobian rows become proportional; after this no
 * species exceeds the totals that make it.
 */
export function presolve(ws: Workspace, state: SolverState): void {
  const p = ws.p
  const { nc, colStart, colSpecies, colNu } = p
  for (let pass = 0; pass < PRESOLVE_PASSES; pass++) {
    computeSpecies(ws, state)
    let moved = false
    for (let j = 0; j < nc; j++) {
      if (p.mode[j] !== MODE_TOTAL || !(p.total[j] > 0)) continue
      let sum = 0
      let nuMax = 0
      let positive = true
      for (let e = colStart[j]; e < colStart[j + 1]; e++) {
        const v = colNu[e]
        if (v < 0) { positive = false; break }
        sum += v * ws.c[colSpecies[e]]; nuMax = Math.max(nuMax, v)
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
const MAX_BALANCE_PRESTEP = 1

/** Largest change of one log10 c in one presolve pass. */
const MAX_PRESOLVE_STEP = 10
