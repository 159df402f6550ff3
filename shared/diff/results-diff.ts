/**
 * How the answer moved between two solved revisions: pH, ionic strength,
 * each species' concentration with the factor it moved by, solids that
 * appear or vanish. For sweeps over the same points, the largest change
 * along the sweep for each quantity, and where it happens. Pure: no Vue, no
 * Nitro.
 */
import type { Result, SweepResult } from '../types/result'
import { isMapAnswer, isTitrationResult } from '../types/result'
import { mapCell } from '../results/map-columns'
import { hasDissolvedTotal } from '../results/names'

/** A concentration below this (mol/L) is treated as absent when computing factors. */
const NEGLIGIBLE = 1e-30

export interface ScalarChange {
  from: number
  to: number
  /** to − from for pH; to / from for ionic strength. */
  change: number
  /** The sweep value where the change is largest (null for a single solve). */
  at: number | null
}

export interface SpeciesChange {
  name: string
  /** mol/L; null when the species is not in that revision. */
  from: number | null
  to: number | null
  /** to / from; null when either side is absent. */
  factor: number | null
  /** |log10 factor|, the size of the effect used for ordering (Infinity for a species that appears or goes). */
  size: number
  at: number | null
}

export interface SolidChange {
  name: string
  /** 'appears': absent in the old answer and present in the new; 'vanishes': the reverse. */
  change: 'appears' | 'vanishes'
  /** The sweep values where it does so (empty for a single solve). */
  at: number[]
  /** The same points as runs of neighbouring sweep points, [first, last] each, for a short description. */
  ranges: [number, number][]
}

export interface SaturationChange {
  name: string
  /** Saturation index (log10 of ion activity product over the solubility product) before and after. */
  from: number
  to: number
  /** to − from, in log10 units like a species' factor. */
  change: number
  at: number | null
}

export interface ResultsDiff {
  kind: 'single' | 'sweep'
  /** For sweeps: the swept variable and its component, e.g. "pH" or "total of Cu^2+". */
  sweep: string | null
  pH: ScalarChange | null
  ionicStrength: ScalarChange | null
  /** Largest effect first. */
  species: SpeciesChange[]
  /**
   * Components' dissolved totals (Σ ν·c over aqueous species, "dissolved Ni")
   * that moved, largest effect first; `name` is the component. Absent in
   * diffs of answers without dissolved totals.
   */
  dissolved: SpeciesChange[]
  solids: SolidChange[]
  /** Saturation indices that moved, largest first (also of solids that stay dissolved). */
  saturation: SaturationChange[]
  /** Points (or the single solve) that did not converge in either answer, so their numbers are not trusted. */
  unconverged: { revision: 'from' | 'to'; at: number | null }[]
}

export type SolvedAnswer = Result | SweepResult

function isSweep(answer: SolvedAnswer): answer is SweepResult {
  return Array.isArray((answer as SweepResult).points)
}

function sweepLabel(s: SweepResult): string {
  return s.component ? `${s.variable} of ${s.component}` : s.variable
}

/** Why two answers cannot be compared point by point, or null when they can. */
export function incomparableReason(a: SolvedAnswer, b: SolvedAnswer): string | null {
  if (isMapAnswer(a) || isMapAnswer(b)) return 'Map answers are not compared cell by cell: open each revision\'s run to read its map.'
  if (isTitrationResult(a) || isTitrationResult(b)) return 'Titration answers are not compared point by point: open each revision\'s run to read its curve and end points.'
  if (isSweep(a) !== isSweep(b)) return 'One revision is a sweep and the other a single solve, so their answers are not compared point by point.'
  if (isSweep(a) && isSweep(b)) {
    if (sweepLabel(a) !== sweepLabel(b)) return `The sweeps differ (${sweepLabel(a)} against ${sweepLabel(b)}), so their answers are not compared point by point.`
    const same = a.values.length === b.values.length && a.values.every((v, i) => Math.abs(v - b.values[i]!) <= 1e-9 * Math.max(1, Math.abs(v)))
    if (!same) return 'The sweeps run over different points, so their answers are not compared point by point.'
  }
  return null
}

function speciesAt(point: Result, name: string): number | null {
  const found = point.species.find(s => s.name === name)
  return found ? found.concentration : null
}

function dissolvedAt(point: Result, component: string): number | null {
  return point.components.find(c => c.name === component)?.dissolved ?? null
}

function speciesChange(name: string, from: number | null, to: number | null, at: number | null): SpeciesChange {
  if (from === null || to === null) return { name, from, to, factor: null, size: Infinity, at }
  const a = Math.max(from, NEGLIGIBLE)
  const b = Math.max(to, NEGLIGIBLE)
  const factor = b / a
  return { name, from, to, factor, size: Math.abs(Math.log10(factor)), at }
}

function pairs(a: SolvedAnswer, b: SolvedAnswer): { from: Result; to: Result; at: number | null }[] {
  if (isSweep(a) && isSweep(b)) return a.points.map((p, i) => ({ from: p, to: b.points[i]!, at: a.values[i] ?? null }))
  return [{ from: a as Result, to: b as Result, at: null }]
}

/** Runs of consecutive indices, as [first, last] pairs. */
function runsOf(indices: number[]): [number, number][] {
  const runs: [number, number][] = []
  for (const i of indices) {
    const last = runs[runs.length - 1]
    if (last && i === last[1] + 1) last[1] = i
    else runs.push([i, i])
  }
  return runs
}

/** The change with the largest size along the sweep (the first one on ties). */
function largest<T>(items: T[], size: (t: T) => number): T | null {
  let best: T | null = null
  let bestSize = -1
  for (const item of items) {
    const s = size(item)
    if (s > bestSize) { best = item; bestSize = s }
  }
  return best
}

/**
 * The results diff of `b` (new revision) against `a` (old). Throws nothing:
 * call `incomparableReason` first; for incomparable answers this compares
 * only the first point of each.
 */
export function diffResults(a: SolvedAnswer, b: SolvedAnswer): ResultsDiff {
  // A map's first point is its first cell.
  if (isMapAnswer(a) && a.x.values.length && a.y.values.length) a = mapCell(a, 0, 0)
  if (isMapAnswer(b) && b.x.values.length && b.y.values.length) b = mapCell(b, 0, 0)
  const comparable = incomparableReason(a, b) === null
  const points = comparable
    ? pairs(a, b)
    : [{ from: isSweep(a) ? a.points[0]! : a, to: isSweep(b) ? b.points[0]! : b, at: null }]
  const withPoints = points.filter(p => p.from && p.to)

  // A model without H+ has no pH to compare (the solver reports one anyway); along a pH sweep the pH is the given variable.
  const pHSwept = comparable && isSweep(a) && a.variable === 'pH'
  const withProton = pHSwept ? [] : withPoints.filter(p => speciesAt(p.from, 'H+') !== null && speciesAt(p.to, 'H+') !== null)
  const pH = largest(withProton.map(p => ({ from: p.from.pH, to: p.to.pH, change: p.to.pH - p.from.pH, at: p.at })), c => Math.abs(c.change))
  const ionicStrength = largest(
    withPoints.map(p => ({ from: p.from.ionicStrength, to: p.to.ionicStrength, change: Math.max(p.to.ionicStrength, NEGLIGIBLE) / Math.max(p.from.ionicStrength, NEGLIGIBLE), at: p.at })),
    c => Math.abs(Math.log10(c.change)),
  )

  const names = new Set<string>()
  for (const p of withPoints) for (const s of [...p.from.species, ...p.to.species]) names.add(s.name)
  const species: SpeciesChange[] = []
  for (const name of names) {
    const along = withPoints.map(p => speciesChange(name, speciesAt(p.from, name), speciesAt(p.to, name), p.at))
    const biggest = largest(along, c => c.size)
    if (biggest && biggest.size > 0) species.push(biggest)
  }
  species.sort((x, y) => y.size - x.size || x.name.localeCompare(y.name))

  const componentNames = new Set<string>()
  for (const p of withPoints) for (const c of [...p.from.components, ...p.to.components]) if (c.dissolved !== undefined && hasDissolvedTotal(c.name)) componentNames.add(c.name)
  const dissolved: SpeciesChange[] = []
  for (const name of componentNames) {
    const along = withPoints.map(p => speciesChange(name, dissolvedAt(p.from, name), dissolvedAt(p.to, name), p.at))
    const biggest = largest(along, c => c.size)
    // Below a part in a million the move is noise of the solve, not of the model.
    if (biggest && biggest.size > 4e-7) dissolved.push(biggest)
  }
  dissolved.sort((x, y) => y.size - x.size || x.name.localeCompare(y.name))

  const solidNames = new Set<string>()
  for (const p of withPoints) for (const s of [...p.from.solids, ...p.to.solids]) solidNames.add(s.name)
  const solids: SolidChange[] = []
  for (const name of solidNames) {
    const appears: number[] = []
    const vanishes: number[] = []
    for (let i = 0; i < withPoints.length; i++) {
      const p = withPoints[i]!
      const was = p.from.solids.find(s => s.name === name)?.present ?? false
      const is = p.to.solids.find(s => s.name === name)?.present ?? false
      if (!was && is) appears.push(i)
      if (was && !is) vanishes.push(i)
    }
    for (const [change, indices] of [['appears', appears], ['vanishes', vanishes]] as const) {
      if (!indices.length) continue
      const value = (i: number) => withPoints[i]!.at
      const at = indices.map(value).filter((v): v is number => v !== null)
      solids.push({ name, change, at, ranges: at.length ? runsOf(indices).map(([first, last]) => [value(first)!, value(last)!]) : [] })
    }
  }
  solids.sort((x, y) => y.at.length - x.at.length || x.name.localeCompare(y.name))

  const saturation: SaturationChange[] = []
  for (const name of solidNames) {
    const along: SaturationChange[] = []
    for (const p of withPoints) {
      const was = p.from.solids.find(s => s.name === name)
      const is = p.to.solids.find(s => s.name === name)
      // A solid with no saturation index (null: a component of it has a total of 0) has no change to show.
      const from = was?.saturationIndex ?? null
      const to = is?.saturationIndex ?? null
      if (from !== null && to !== null && Number.isFinite(from) && Number.isFinite(to)) {
        along.push({ name, from, to, change: to - from, at: p.at })
      }
    }
    const biggest = largest(along, c => Math.abs(c.change))
    // Saturation indices are read to two decimals: smaller moves are noise of the solve.
    if (biggest && Math.abs(biggest.change) >= 0.005) saturation.push(biggest)
  }
  saturation.sort((x, y) => Math.abs(y.change) - Math.abs(x.change) || x.name.localeCompare(y.name))

  const unconverged: ResultsDiff['unconverged'] = []
  for (const p of withPoints) {
    if (!p.from.converged) unconverged.push({ revision: 'from', at: p.at })
    if (!p.to.converged) unconverged.push({ revision: 'to', at: p.at })
  }

  return {
    kind: comparable && isSweep(a) ? 'sweep' : 'single',
    sweep: comparable && isSweep(a) ? sweepLabel(a) : null,
    pH, ionicStrength, species, dissolved, solids, saturation, unconverged,
  }
}
