/**
 * Which solids are present: an active-set loop on the phase rule around the
 * Newton solve. Add the most supersaturated solid, drop one whose amount goes
 * negative, repeat until neither happens; a set seen twice is a cycle.
 */
import { MODE_TOTAL, type Problem } from './problem'
import { newton, type Limits, type SolverState, type Workspace } from './newton'

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
}

/** Saturation index of solid s at the component activities x. */
export function saturationIndex(p: Problem, x: Float64Array, s: number): number {
  let si = p.solidLogK[s]
  for (let j = 0; j < p.nc; j++) si += p.solidNu[s * p.nc + j] * x[j]
  return si
}

/** A solid can only be present if it takes up a component under a mass balance. */
function canPrecipitate(p: Problem, s: number): boolean {
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
  let iterations = 0
  let lastAdd = -1
  const rounds = 4 * p.nsol + 4
  for (let round = 0; round <= rounds; round++) {
    const left = limits.maxIterations - iterations
    const out = newton(ws, state, { maxIterations: Math.max(1, left), deadline: limits.deadline })
    iterations += out.iterations
    if (!out.ok) {
      const last = lastAdd
      lastAdd = -1
      if (out.singular && last >= 0 && state.active[last]) {
        // The solid just added made the equations dependent (its stoichiometry
        // is a combination of the others present): leave it out and go on.
        state.active[last] = 0; state.n[last] = 0; blocked[last] = 1
        notes.push(`${p.model.solids[last].name} could not join the other solids present (its equation depends on theirs); it was left out.`)
        continue
      }
      return { ok: false, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, reason: out.reason, notes }
    }
    let drop = -1
    for (let s = 0; s < p.nsol; s++) if (state.active[s] && state.n[s] < 0 && (drop < 0 || state.n[s] < state.n[drop])) drop = s
    if (drop >= 0) {
      state.active[drop] = 0; state.n[drop] = 0
      if (!remember(seen, state.active)) return cycling(p, iterations, out, notes)
      continue
    }
    let add = -1
    let best = SUPERSATURATION_TOLERANCE
    for (let s = 0; s < p.nsol; s++) {
      if (state.active[s] || blocked[s] || !canPrecipitate(p, s)) continue
      const si = saturationIndex(p, state.x, s)
      if (si > best) { best = si; add = s }
    }
    if (add < 0) {
      addFixedSupersaturationNotes(p, state, notes)
      return { ok: true, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, notes }
    }
    let present = 0
    for (let s = 0; s < p.nsol; s++) present += state.active[s]
    if (present >= maxSolids) {
      return {
        ok: false, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, notes,
        reason: `${p.model.solids[add].name} is supersaturated (SI ${best.toFixed(3)}) but ${present} solids are already present with only ${maxSolids} components under a mass balance (phase rule)`,
      }
    }
    state.active[add] = 1; state.n[add] = 0
    lastAdd = add
    if (!remember(seen, state.active)) return cycling(p, iterations, out, notes)
  }
  return { ok: false, iterations, maxScaled: Infinity, worstRow: 0, notes, reason: 'the choice of solids present did not settle' }
}

function remember(seen: Set<string>, active: Uint8Array): boolean {
  const key = keyOf(active)
  if (seen.has(key)) return false
  seen.add(key)
  return true
}

function cycling(p: Problem, iterations: number, out: { maxScaled: number; worstRow: number }, notes: string[]): PhaseOutcome {
  return {
    ok: false, iterations, maxScaled: out.maxScaled, worstRow: out.worstRow, notes,
    reason: `the set of solids present cycles (${p.model.solids.map((s) => s.name).join(', ')} keep joining and leaving): their constants may contradict each other`,
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
