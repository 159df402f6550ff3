/**
 * Starting values for solids that join the active set. A solid that joins
 * from zero with its saturation index at, say, 5 costs Newton four capped
 * steps before the solid takes its share; started from an estimate of that
 * share, it costs about none. Solids that share no mass-balance component
 * with each other or with the present ones cannot compete for material, so
 * they may join in one round instead of one per round.
 */
import { MODE_TOTAL, type Problem } from './problem'
import type { SolverState, Workspace } from './workspace'

/** Whether solid s takes up mass-balance component j. */
function holds(p: Problem, s: number, j: number): boolean {
  return p.mode[j] === MODE_TOTAL && p.solidNu[s * p.nc + j] !== 0
}

/** Whether solids s and t share a mass-balance component. */
function share(p: Problem, s: number, t: number): boolean {
  for (let j = 0; j < p.nc; j++) if (holds(p, s, j) && holds(p, t, j)) return true
  return false
}

/** Whether solid s shares a mass-balance component with any present solid other than itself. */
function sharesWithPresent(p: Problem, state: SolverState, s: number): boolean {
  for (let t = 0; t < p.nsol; t++) if (t !== s && state.active[t] && share(p, s, t)) return true
  return false
}

/**
 * Marks as present, besides `first` (already marked), every other
 * supersaturated solid in `candidates` that shares no mass-balance component
 * with a present solid, most supersaturated first, within `room` more solids.
 * Returns the solids it marked.
 */
export function joinIndependent(p: Problem, state: SolverState, candidates: { solid: number; si: number }[], room: number): number[] {
  const joined: number[] = []
  const order = [...candidates].sort((a, b) => b.si - a.si)
  for (const { solid } of order) {
    if (joined.length >= room) break
    if (state.active[solid] || sharesWithPresent(p, state, solid)) continue
    state.active[solid] = 1
    state.n[solid] = 0
    joined.push(solid)
  }
  return joined
}

/**
 * For each solid in `joining` (just marked present, at saturation index si
 * of the species in ws): the mass-balance component it depletes first, not
 * held by another present solid, has its free concentration lowered by
 * si/ν, which brings the saturation index to about zero; the solid starts
 * with the amount that leaves solution (bounded by what the totals allow).
 * Solids without such a component start from zero as before. True when
 * anything was estimated.
 */
export function estimateJoining(ws: Workspace, state: SolverState, joining: { solid: number; si: number }[]): boolean {
  const p = ws.p
  const { nc, nsp, nu } = p
  const shifts: { j: number; by: number }[] = []
  for (const { solid: s, si } of joining) {
    let best = -1
    let bestRatio = Infinity
    let bestDissolved = 0
    let most = Infinity
    for (let j = 0; j < nc; j++) {
      const v = p.solidNu[s * nc + j]
      if (p.mode[j] !== MODE_TOTAL || v <= 0) continue
      if (ws.bounds[j]) most = Math.min(most, Math.max(p.total[j], 0) / v)
      let owned = false
      for (let t = 0; t < p.nsol; t++) if (t !== s && state.active[t] && p.solidNu[t * nc + j] !== 0) owned = true
      if (owned) continue
      let dissolved = 0
      for (let i = 0; i < nsp; i++) dissolved += nu[i * nc + j] * ws.c[i]
      if (!(dissolved > 0) || !Number.isFinite(dissolved)) continue
      if (dissolved / v < bestRatio) { bestRatio = dissolved / v; best = j; bestDissolved = dissolved }
    }
    if (best < 0 || !(si > 0)) continue
    const v = p.solidNu[s * nc + best]
    const leaves = (bestDissolved * -Math.expm1((-si / v) * Math.LN10)) / v
    state.n[s] = Math.min(leaves, most)
    shifts.push({ j: best, by: -si / v })
  }
  for (const { j, by } of shifts) state.y[j] += by
  return shifts.length > 0
}
