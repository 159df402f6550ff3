/**
 * Monte Carlo over the constants for a sweep or a titration curve
 * (`uncertainty draws N [seed S]`): each draw moves the log K of every
 * reaction that carries a ± by σ·z, z standard normal (independent
 * constants), moves the formation constants by the compiler's
 * `reactionWeights`, and solves the whole study again. Each point then gets,
 * for its pH, every species' log10 c, each saturation index, each log10 p
 * and each dissolved total, the median and the 2.5 and 97.5 % quantiles over
 * the draws that converged there.
 *
 * The generator is pure-rand's xoroshiro128+ seeded with S, and the normal
 * deviates come from Box–Muller on its uniform doubles, drawn in the same
 * order whatever the solves do: the same model and seed give the same bands.
 */
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus'
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64'
import type { Model } from '../../shared/poise/model'
import type { AnswerUncertainty, Result, UncertaintySummary } from '../../shared/types/result'
import { uncertainConstants, uncertaintySummary } from './uncertainty'
import type { SolveOptions } from './index'

/** A deterministic stream of standard normal deviates from a seed. */
export function normalStream(seed: number): () => number {
  const rng = xoroshiro128plus(seed)
  let spare: number | null = null
  return () => {
    if (spare !== null) { const z = spare; spare = null; return z }
    // Box–Muller (closed form): u1 in (0, 1] so the log is finite.
    const u1 = 1 - uniformFloat64(rng)
    const u2 = uniformFloat64(rng)
    const r = Math.sqrt(-2 * Math.log(u1))
    spare = r * Math.sin(2 * Math.PI * u2)
    return r * Math.cos(2 * Math.PI * u2)
  }
}

/**
 * The model with the log K of each reaction r moved by delta[r] (an entry
 * per model.reactions): every species, solid and gas moves by Σ weight ×
 * delta through its `reactionWeights`, at both temperatures.
 */
export function modelWithLogKShifts(model: Model, delta: ArrayLike<number>): Model {
  const move = <T extends { logK: number; logKRef: number; reactionWeights?: { reaction: number; weight: number }[] }>(list: T[]): T[] =>
    list.map((x) => {
      let d = 0
      for (const w of x.reactionWeights ?? []) d += w.weight * (delta[w.reaction] ?? 0)
      return d === 0 ? x : { ...x, logK: x.logK + d, logKRef: x.logKRef + d }
    })
  return {
    ...model,
    reactions: model.reactions.map((r, k) => (delta[k] ? { ...r, logK: r.logK + delta[k]! } : r)),
    species: move(model.species), solids: move(model.solids), gases: move(model.gases),
  }
}

/** The q-quantile of sorted values (linear between order statistics, Hyndman–Fan type 7). */
export function quantile(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length
  if (n === 0) return Number.NaN
  const h = (n - 1) * q
  const lo = Math.floor(h)
  const hi = Math.min(n - 1, lo + 1)
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!)
}

/** Median and 2.5–97.5 % band of the finite values among the draws; null when none. */
export function band(values: Float64Array): AnswerUncertainty | null {
  const finite = values.filter((v) => Number.isFinite(v)).sort()
  if (finite.length === 0) return null
  const low = quantile(finite, 0.025)
  const high = quantile(finite, 0.975)
  return { sigma: (high - low) / (2 * 1.959963984540054), median: quantile(finite, 0.5), low, high }
}

export interface MonteCarloBands {
  summary: UncertaintySummary
  /** Adds the bands of point `index` to that point of the answer (a converged one). */
  attach(point: Result, index: number): void
}

/**
 * Draws the constants `model.monteCarlo.draws` times and solves the study
 * with each (`run` gives the points of one study of a model); null when the
 * model asks for no Monte Carlo or no constant carries a ±. Draws stop at
 * `deadline` (a Date.now() value); the summary then says how many were made.
 */
export function monteCarloBands(model: Model, deadline: number, options: SolveOptions | undefined, run: (model: Model, options: SolveOptions) => Result[]): MonteCarloBands | null {
  const mc = model.monteCarlo
  const constants = uncertainConstants(model)
  if (!mc || constants.length === 0) return null
  const draws = mc.draws
  const next = normalStream(mc.seed)
  /** Per point, per quantity (`pH`, `s:NAME`, `x:NAME`, `g:NAME`, `c:NAME`), one value a draw (NaN where the draw failed). */
  const samples: Map<string, Float64Array>[] = []
  const record = (i: number, key: string, d: number, v: number | null | undefined) => {
    if (v === null || v === undefined) return
    let byKey = samples[i]
    if (!byKey) { byKey = new Map(); samples[i] = byKey }
    let arr = byKey.get(key)
    if (!arr) { arr = new Float64Array(draws).fill(Number.NaN); byKey.set(key, arr) }
    arr[d] = v
  }
  const base: Model = { ...model }
  delete base.monteCarlo
  delete base.limits
  let made = 0
  let failed = 0
  const delta = new Float64Array(model.reactions.length)
  for (let d = 0; d < draws; d++) {
    // Every deviate of a draw is taken before any solve, so the stream does not depend on the solves.
    for (const c of constants) delta[c.index] = c.sigma * next()
    if (Date.now() > deadline) break
    const points = run(modelWithLogKShifts(base, delta), { ...options, deadline })
    made++
    let anyFailed = false
    points.forEach((r, i) => {
      if (!r.converged) { anyFailed = true; return }
      record(i, 'pH', d, r.pH)
      for (const s of r.species) record(i, `s:${s.name}`, d, s.log10)
      for (const s of r.solids) record(i, `x:${s.name}`, d, s.saturationIndex)
      for (const g of r.gases ?? []) record(i, `g:${g.name}`, d, g.log10)
      for (const c of r.components) record(i, `c:${c.name}`, d, c.dissolved)
    })
    if (anyFailed) failed++
  }
  const summary: UncertaintySummary = { ...uncertaintySummary(model, 'monte-carlo'), samples: made, seed: mc.seed, failed }
  if (made < draws) summary.note = `${made} of ${draws} draws were made before the time budget ran out: the bands rest on fewer draws than asked. Use fewer draws or points for the full number.`
  return {
    summary,
    attach(point, i) {
      const byKey = samples[i]
      if (!point.converged || !byKey) return
      const get = (key: string) => { const v = byKey.get(key); return v ? band(v) : null }
      const pH = get('pH')
      if (pH) point.pHUncertainty = pH
      for (const s of point.species) { const b = s.log10 !== null ? get(`s:${s.name}`) : null; if (b) s.log10Uncertainty = b }
      for (const s of point.solids) { const b = s.saturationIndex !== null ? get(`x:${s.name}`) : null; if (b) s.saturationIndexUncertainty = b }
      for (const g of point.gases ?? []) { const b = g.log10 !== null ? get(`g:${g.name}`) : null; if (b) g.log10Uncertainty = b }
      for (const c of point.components) { const b = c.dissolved !== undefined ? get(`c:${c.name}`) : null; if (b) c.dissolvedUncertainty = b }
      point.uncertainty = summary
    },
  }
}
