/**
 * Which solids are present: an active-set loop on the phase rule around the
 * Newton solve. Add the most supersaturated solid, drop one whose amount goes
 * negative, repeat until neither happens; a set seen twice is a cycle.
 */
import { Matrix, solve } from 'ml-matrix'
import { MODE_TOTAL, type Problem } from './problem'
import { newton } from './newton'
import { estimateJoining, joinIndependent } from './joining'
import type { Limits, SolverState, Workspace } from './workspace'

/** The phase loop's iteration budget, in multiples of the budget of one set of solids. */
export const PHASE_BUDGET_FACTOR = 3

/** A solid joins when its saturation index exceeds this. */
export const SUPERSATURATION_TOLERANCE = 1e-9

export interface PhaseOutcome {
  ok: boolean
  iterations: number
  maxScaled: number
  worstRow: number
  reason?: string
  /** Notes for the result: solids that cannot precipitate although supersaturated. */
  notes: string[]
  /** The wall-clock guard stopped the solve. */
  timedOut?: boolean
  /** The equation that did not close, in words (Workspace.rowName), when Newton failed. */
  equation?: string
}

/** Saturation index of solid s at the component activities x. */
export function saturationIndex(p: Problem, x: Float64Array, s: number): number {
  let si = p.solidLogK[s]
  for (let j = 0; j < p.nc; j++) si += p.solidNu[s * p.nc + j] * x[j]
  return si
}

/** A solid can only be present if it takes up a component under a mass balance. */
export function canPrecipitate(p: Problem, s: number): boolean {
  if (p.suppressed[s]) return false
  for (let j = 0; j < p.nc; j++) if (p.mode[j] === MODE_TOTAL && p.solidNu[s * p.nc + j] !== 0) return true
  return false
}

function countTotals(p: Problem): number {
  let k = 0
  for (let j = 0; j < p.nc; j++) if (p.mode[j] === MODE_TOTAL) k++
  return k
}

const keyOf = (active: Uint8Array) => active.join('')

export function solveWithPhases(ws: Workspace, state: SolverState, limits: Limits): PhaseOutcome {
  const p = ws.p
  const notes: string[] = []
  const maxSolids = countTotals(p)
  const blocked = new Uint8Array(p.nsol)
  for (let s = 0; s < p.nsol; s++) if (!canPrecipitate(p, s)) { state.active[s] = 0; state.n[s] = 0 }
  let active = 0
  for (let s = 0; s < p.nsol; s++) active += state.active[s]
  if (active > maxSolids) { state.active.fill(0); state.n.fill(0) }
  const seen = new Set<string>([keyOf(state.active)])
  const good = { y: new Float64Array(state.y), n: new Float64Array(state.n), u: state.u }
  let iterations = 0
  let lastAdd = -1
  // Solids that joined with lastAdd, and whether the round started from estimates.
  let alongside: number[] = []
  let estimated = false
  const rounds = 4 * p.nsol + 4
  for (let round = 0; round <= rounds; round++) {
    // Each set of solids may take maxIterations; all of them together
    // PHASE_BUDGET_FACTOR times that (deterministic: counted, not timed).
    const left = Math.min(limits.maxIterations, PHASE_BUDGET_FACTOR * limits.maxIterations - iterations)
    if (left <= 0) {
      return { ok: false, iterations, maxScaled: Infinity, worstRow: 0, notes, equation: '', reason: `the choice of solids present did not settle within ${PHASE_BUDGET_FACTOR * limits.maxIterations} iterations` }
    }
    const shortcut = estimated || alongside.length > 0
    // A round started by the shortcut leaves half the iterations to the plain repeat.
    const allowed = shortcut ? Math.ceil(left / 2) : left
    const out = newton(ws, state, { ...limits, maxIterations: Math.max(1, allowed) })
    iterations += out.iterations
    // Solids that joined together must all stay; if one would leave, the
    // plain way (one at a time) decides, so the sets tried are its own.
    if (shortcut && (!out.ok || (alongside.length > 0 && anyNegative(state)))) {
      // Repeat the round the plain way, lastAdd alone from zero, without
      // counting it as a round of its own.
      seen.delete(keyOf(state.active))
      restore(state, good)
      for (const s of alongside) { state.active[s] = 0; state.n[s] = 0 }
      alongside = []
      estimated = false
      remember(seen, state.active)
      round--
      continue
    }
    if (!out.ok) {
      const added = lastAdd
      if (out.singular && added >= 0 && state.active[added]) {
        // The solid just added made the saturation equations dependent (its
        // stoichiometry combines those of solids present): with them all it
        // would over-fix the activities. Swap one of the others out for it.
        restore(state, good)
        if (!swapOut(p, state, added, seen)) {
          state.active[added] = 0; state.n[added] = 0; blocked[added] = 1; lastAdd = -1
        }
        continue
      }
      // A present solid at a negative amount cannot belong to the answer,
      // whether or not Newton closed with it: drop it before anything else
      // (the largest share of a total first) and solve again from the last
      // solved point.
      const negative = mostNegative(p, state)
      if (negative >= 0 && !out.timedOut) {
        state.active[negative] = 0; state.n[negative] = 0
        if (remember(seen, state.active)) {
          restore(state, good)
          lastAdd = -1
          continue
        }
        state.active[negative] = 1
      }
      return { ok: false, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, reason: out.reason, notes, timedOut: out.timedOut, equation: ws.rowName(out.worstRow) }
    }
    lastAdd = -1
    alongside = []
    estimated = false
    snapshot(good, state)
    const drop = mostNegative(p, state)
    if (drop >= 0) {
      state.active[drop] = 0; state.n[drop] = 0
      if (!remember(seen, state.active)) return cycling(p, drop, 'leaves', iterations, out, notes)
      continue
    }
    let add = -1
    let best = SUPERSATURATION_TOLERANCE
    const supersaturated: { solid: number; si: number }[] = []
    for (let s = 0; s < p.nsol; s++) {
      if (state.active[s] || blocked[s] || !canPrecipitate(p, s)) continue
      const si = saturationIndex(p, state.x, s)
      if (si > SUPERSATURATION_TOLERANCE) supersaturated.push({ solid: s, si })
      if (si > best) { best = si; add = s }
    }
    if (add < 0) {
      const stuck = blockedSupersaturated(p, state, blocked)
      if (stuck) {
        return { ok: false, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, notes, ...stuck }
      }
      addFixedSupersaturationNotes(p, state, notes)
      return { ok: true, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, notes }
    }
    let present = 0
    for (let s = 0; s < p.nsol; s++) present += state.active[s]
    if (present >= maxSolids) {
      return {
        ok: false, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, notes,
        equation: `the saturation of ${p.model.solids[add].name}`,
        reason: `${p.model.solids[add].name} is supersaturated (SI ${best.toFixed(3)}) but ${present} solids are already present with only ${maxSolids} components under a mass balance (phase rule)`,
      }
    }
    state.active[add] = 1; state.n[add] = 0
    lastAdd = add
    if (seen.has(keyOf(state.active))) return cycling(p, add, 'joins', iterations, out, notes)
    alongside = joinIndependent(p, state, supersaturated.filter((c) => c.solid !== add), maxSolids - present - 1)
    if (alongside.length > 0 && seen.has(keyOf(state.active))) {
      for (const s of alongside) { state.active[s] = 0; state.n[s] = 0 }
      alongside = []
    }
    remember(seen, state.active)
    const joining = supersaturated.filter((c) => c.solid === add || alongside.includes(c.solid))
    estimated = estimateJoining(ws, state, joining)
  }
  return { ok: false, iterations, maxScaled: Infinity, worstRow: 0, notes, reason: 'the choice of solids present did not settle' }
}

/**
 * The present solid whose negative amount is the largest share of a total
 * it draws on (so a solid of three metal atoms weighs three times its
 * amount), or −1 when none is negative.
 */
function mostNegative(p: Problem, state: SolverState): number {
  let drop = -1
  let worst = 0
  for (let s = 0; s < p.nsol; s++) {
    if (!state.active[s] || !(state.n[s] < 0)) continue
    let share = 0
    for (let j = 0; j < p.nc; j++) {
      const v = Math.abs(p.solidNu[s * p.nc + j])
      if (p.mode[j] === MODE_TOTAL && v > 0) share = Math.max(share, (v * -state.n[s]) / Math.max(Math.abs(p.total[j]), 1e-300))
    }
    if (share === 0) share = -state.n[s]
    if (drop < 0 || share > worst) { drop = s; worst = share }
  }
  return drop
}

function anyNegative(state: SolverState): boolean {
  for (let s = 0; s < state.n.length; s++) if (state.active[s] && state.n[s] < 0) return true
  return false
}

interface Snapshot { y: Float64Array; n: Float64Array; u: number }

function snapshot(to: Snapshot, state: SolverState): void {
  to.y.set(state.y); to.n.set(state.n); to.u = state.u
}

/** Back to the last solved point, keeping the active set (amounts of solids no longer present zeroed). */
function restore(state: SolverState, from: Snapshot): void {
  state.y.set(from.y); state.u = from.u
  for (let s = 0; s < state.n.length; s++) state.n[s] = state.active[s] ? from.n[s] : 0
}

/**
 * Takes out one present solid so that `added` can stay, choosing a set not
 * tried before; false when every choice was tried. When the added solid's
 * stoichiometry over the mass balances combines those of the present ones
 * (ν_added = Σ c_k ν_k), the solid to leave is the one a growing amount of
 * the added solid would use up first (smallest n_k / c_k over c_k > 0, the
 * ratio test of the simplex method), so every amount stays non-negative;
 * then the others, smallest amount first.
 */
function swapOut(p: Problem, state: SolverState, added: number, seen: Set<string>): boolean {
  const present: number[] = []
  for (let s = 0; s < p.nsol; s++) if (state.active[s] && s !== added) present.push(s)
  const order = ratioOrder(p, state, added, present)
  for (const k of present.sort((a, b) => state.n[a] - state.n[b])) if (!order.includes(k)) order.push(k)
  for (const k of order) {
    state.active[k] = 0
    if (remember(seen, state.active)) { state.n[k] = 0; return true }
    state.active[k] = 1
  }
  return false
}

/** Present solids in the order of the ratio test for `added` (see swapOut); empty when it is not a combination of them. */
function ratioOrder(p: Problem, state: SolverState, added: number, present: number[]): number[] {
  const rows: number[] = []
  for (let j = 0; j < p.nc; j++) if (p.mode[j] === MODE_TOTAL) rows.push(j)
  if (present.length === 0 || rows.length === 0) return []
  const A = new Matrix(rows.length, present.length)
  const b = new Matrix(rows.length, 1)
  rows.forEach((j, r) => {
    present.forEach((k, c) => A.set(r, c, p.solidNu[k * p.nc + j]))
    b.set(r, 0, p.solidNu[added * p.nc + j])
  })
  let coefficients: Matrix
  try {
    coefficients = solve(A, b, true)
  } catch {
    return []
  }
  // Only a true combination: the fit must reproduce the added solid's stoichiometry.
  const fit = A.mmul(coefficients)
  for (let r = 0; r < rows.length; r++) if (Math.abs(fit.get(r, 0) - b.get(r, 0)) > 1e-9 * (1 + Math.abs(b.get(r, 0)))) return []
  return present
    .map((k, c) => ({ k, c: coefficients.get(c, 0) }))
    .filter(({ c }) => c > 1e-9)
    .sort((x, y) => Math.max(state.n[x.k], 0) / x.c - Math.max(state.n[y.k], 0) / y.c)
    .map(({ k }) => k)
}

/** The equation and reason when a solid that had to be left out is still supersaturated at the end. */
function blockedSupersaturated(p: Problem, state: SolverState, blocked: Uint8Array): { equation: string; reason: string } | null {
  for (let s = 0; s < p.nsol; s++) {
    if (!blocked[s]) continue
    const si = saturationIndex(p, state.x, s)
    if (si > SUPERSATURATION_TOLERANCE) {
      const name = p.model.solids[s].name
      return {
        equation: `the saturation of ${name}`,
        reason: `${name} stays supersaturated (SI ${si.toExponential(2)}) but no set of solids including it could be solved (its saturation equation depends on those of the others)`,
      }
    }
  }
  return null
}

function remember(seen: Set<string>, active: Uint8Array): boolean {
  const key = keyOf(active)
  if (seen.has(key)) return false
  seen.add(key)
  return true
}

function cycling(p: Problem, solid: number, move: 'joins' | 'leaves', iterations: number, out: { maxScaled: number; worstRow: number }, notes: string[]): PhaseOutcome {
  return {
    ok: false, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, notes,
    equation: `the saturation of ${p.model.solids[solid].name}`,
    reason: `the set of solids present cycles: ${p.model.solids[solid].name} ${move} a set of solids tried before; their constants may be too close to tell which is stable`,
  }
}

function addFixedSupersaturationNotes(p: Problem, state: SolverState, notes: string[]): void {
  for (let s = 0; s < p.nsol; s++) {
    if (p.suppressed[s] || canPrecipitate(p, s)) continue
    const si = saturationIndex(p, state.x, s)
    if (si > SUPERSATURATION_TOLERANCE) {
      notes.push(`${p.model.solids[s].name} is supersaturated (SI ${si.toFixed(3)}) but every component it holds is fixed, so it cannot precipitate here.`)
    }
  }
}
