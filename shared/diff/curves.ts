/**
 * The two revisions' sweep curves for one diagram on the compare page: pH
 * and log10 c of every species along each side's own sweep values, thinned
 * to at most `maxPoints` points a side (the ends kept). Null unless both
 * answers are sweeps over the same variable (titrations and single solves
 * have no shared axis). Pure: no Vue, no Nitro.
 */
import type { SweepResult } from '../types/result'
import { isTitrationResult } from '../types/result'
import type { SolvedAnswer } from './results-diff'
import { sweepAxisLabel } from '../results/diagram'

export interface CurveSide {
  /** The sweep values (x) of this side's kept points. */
  values: number[]
}

export interface CompareCurve {
  /** `pH`, or a species' formula as written. */
  name: string
  quantity: 'pH' | 'log10 c'
  /** y along each side's values; null where that side has no number (not converged, no such species). */
  from: (number | null)[]
  to: (number | null)[]
}

export interface CompareCurves {
  /** The swept variable in words with its unit, e.g. "pH" or "Total Cu²⁺ (mol/L)". */
  axis: string
  from: CurveSide
  to: CurveSide
  curves: CompareCurve[]
}

function isSweep(answer: SolvedAnswer): answer is SweepResult {
  return !isTitrationResult(answer) && Array.isArray((answer as SweepResult).points)
}

/** Indices of at most `max` evenly spread points of `n`, first and last included. */
export function thinned(n: number, max: number): number[] {
  if (n <= max) return Array.from({ length: n }, (_, i) => i)
  const picked = new Set<number>()
  for (let k = 0; k < max; k++) picked.add(Math.round((k * (n - 1)) / (max - 1)))
  return [...picked].sort((a, b) => a - b)
}

export function compareCurves(a: SolvedAnswer, b: SolvedAnswer, maxPoints = 201): CompareCurves | null {
  if (!isSweep(a) || !isSweep(b)) return null
  if (a.variable !== b.variable || a.component !== b.component) return null
  const keepA = thinned(a.points.length, maxPoints)
  const keepB = thinned(b.points.length, maxPoints)
  const ok = (p: SweepResult['points'][number] | undefined) => Boolean(p?.converged)
  const pH: CompareCurve = {
    name: 'pH',
    quantity: 'pH',
    from: keepA.map((i) => (ok(a.points[i]) ? a.points[i]!.pH : null)),
    to: keepB.map((i) => (ok(b.points[i]) ? b.points[i]!.pH : null)),
  }
  const names: string[] = []
  for (const answer of [a, b]) {
    for (const s of answer.points.find((p) => p.converged)?.species ?? []) if (!names.includes(s.name)) names.push(s.name)
  }
  const along = (sweep: SweepResult, keep: number[], name: string) =>
    keep.map((i) => {
      const point = sweep.points[i]
      if (!ok(point)) return null
      const log10 = point!.species.find((s) => s.name === name)?.log10
      return typeof log10 === 'number' && Number.isFinite(log10) ? log10 : null
    })
  const species: CompareCurve[] = names.map((name) => ({ name, quantity: 'log10 c', from: along(a, keepA, name), to: along(b, keepB, name) }))
  return {
    axis: sweepAxisLabel(a),
    from: { values: keepA.map((i) => a.values[i]!) },
    to: { values: keepB.map((i) => b.values[i]!) },
    curves: a.variable === 'pH' ? species : [pH, ...species],
  }
}

/** The curve that moved most between the sides (largest |Δy| at the same index), for the diagram to open on. */
export function mostMoved(curves: CompareCurves): CompareCurve | null {
  let best: CompareCurve | null = null
  let most = -1
  for (const curve of curves.curves) {
    const n = Math.min(curve.from.length, curve.to.length)
    let moved = 0
    for (let i = 0; i < n; i++) {
      const f = curve.from[i]
      const t = curve.to[i]
      if (f !== null && f !== undefined && t !== null && t !== undefined) moved = Math.max(moved, Math.abs(t - f))
    }
    if (moved > most) {
      most = moved
      best = curve
    }
  }
  return best
}
