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

/** One draw's values, per point (null: the draw did not converge there), per quantity key (`pH`, `s:NAME`, `x:NAME`, `g:NAME`, `c:NAME`). */
export type DrawSample = (Record<string, number> | null)[]

/** The values a draw gives at each point of the study. */
export function drawSample(points: Result[]): DrawSample {
  return points.map((r) => {
    if (!r.converged) return null
    const out: Record<string, number> = {}
    const put = (key: string, v: number | null | undefined) => { if (v !== null && v !== undefined) out[key] = v }
    put('pH', r.pH)
    for (const s of r.species) put(`s:${s.name}`, s.log10)
    for (const s of r.solids) put(`x:${s.name}`, s.saturationIndex)
    for (const g of r.gases ?? []) put(`g:${g.name}`, g.log10)
    for (const c of r.components) put(`c:${c.name}`, c.dissolved)
    return out
  })
}

/**
 * The log K shifts of draws `from`, `from + 1`, … (one array per call, an
 * entry per model.reactions): the same stream whether the draws are made at
 * once or in slices, since every draw takes its deviates in one order.
 */
export function drawShifts(model: Model, from: number): () => Float64Array {
  const constants = uncertainConstants(model)
  const next = normalStream(model.monteCarlo?.seed ?? 0)
  for (let k = 0; k < from * constants.length; k++) next()
  return () => {
    const delta = new Float64Array(model.reactions.length)
    for (const c of constants) delta[c.index] = c.sigma * next()
    return delta
  }
}

/** The model a draw solves: no Monte Carlo, no limit windows, its constants moved. */
export function drawnModel(model: Model, delta: ArrayLike<number>): Model {
  const base: Model = { ...model }
  delete base.monteCarlo
  delete base.limits
  return modelWithLogKShifts(base, delta)
}

/**
 * The bands from the draws made (`samples`, in draw order); `note` says why
 * fewer draws than asked were made.
 */
export function bandsFromDraws(model: Model, samples: DrawSample[], note: string | null): MonteCarloBands {
  const made = samples.length
  const byPoint: Map<string, Float64Array>[] = []
  let failed = 0
  samples.forEach((sample, d) => {
    if (sample.some((p) => p === null)) failed++
    sample.forEach((values, i) => {
      if (!values) return
      let byKey = byPoint[i]
      if (!byKey) { byKey = new Map(); byPoint[i] = byKey }
      for (const key in values) {
        let arr = byKey.get(key)
        if (!arr) { arr = new Float64Array(made).fill(Number.NaN); byKey.set(key, arr) }
        arr[d] = values[key]!
      }
    })
  })
  const summary: UncertaintySummary = { ...uncertaintySummary(model, 'monte-carlo'), samples: made, seed: model.monteCarlo?.seed, failed }
  if (note) summary.note = note
  return {
    summary,
    attach(point, i) {
      const byKey = byPoint[i]
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

/**
 * Draws the constants `model.monteCarlo.draws` times and solves the study
 * with each (`run` gives the points of one study of a model); null when the
 * model asks for no Monte Carlo or no constant carries a ±. Draws stop at
 * `deadline` (a Date.now() value); the summary then says how many were made.
 * (A stored run makes its draws as a job instead, in slices: the
 * `monte-carlo` study kind, server/jobs/studies.ts.)
 */
export function monteCarloBands(model: Model, deadline: number, options: SolveOptions | undefined, run: (model: Model, options: SolveOptions) => Result[]): MonteCarloBands | null {
  const mc = model.monteCarlo
  if (!mc || uncertainConstants(model).length === 0) return null
  const draws = mc.draws
  const shifts = drawShifts(model, 0)
  const samples: DrawSample[] = []
  for (let d = 0; d < draws; d++) {
    // Every deviate of a draw is taken before any solve, so the stream does not depend on the solves.
    const delta = shifts()
    if (Date.now() > deadline) break
    samples.push(drawSample(run(drawnModel(model, delta), { ...options, deadline })))
  }
  const made = samples.length
  return bandsFromDraws(model, samples, made < draws ? `${made} of ${draws} draws were made before the time budget ran out: the bands rest on fewer draws than asked. Use fewer draws or points for the full number.` : null)
}
