/**
 * Titrations: the sample (the model's totals, in V0) receives the titrant.
 * At an added volume v every `total` component is (V0·T0 + v·Tt)/(V0 + v),
 * dilution included (solids of the sample too: a total holds them), and
 * each point is an exact solve, continued along the curve as a sweep is.
 *
 * - The slope dpH/dv at every point comes from the equations' sensitivity
 *   (sensitivity.ts), not from differences of neighbouring points.
 * - End points: each local maximum of |dpH/dv| that stands out from its
 *   flanks, located by a golden-section search on exact solves to
 *   END_POINT_RESOLUTION of the step.
 * - `titrate to pH X`: the volume is bracketed by exact solves at doubling
 *   volumes and bisected; "not reachable with this titrant" when the pH
 *   does not cross X up to MAX_DOSE_FACTOR times the sample volume.
 */
import type { Model } from '../../shared/poise/model'
import type { EquivalencePoint, Result, TitrationCurveResult, TitrationDoseResult, TitrationResult } from '../../shared/types/result'
import { buildProblem, setComponent, MIN_NONZERO_TOTAL, type Problem } from './problem'
import { Workspace, type SolverState } from './workspace'
import { dLogActivityH, bufferCapacity } from './sensitivity'
import { limitWindows } from './limits'
import {
  continueAlong, copyState, guardOf, internalFailure, iterationsOf, MONTE_CARLO_SHARE, newState, solveProblem, unsolvable,
  type SolveOptions,
} from './index'
import { monteCarloBands } from './montecarlo'

/**
 * An end point is located to this share of the two steps around it: far
 * better than a tenth of the step, so that the pH reported there is the
 * pH at the steepest point, not beside it.
 */
export const END_POINT_RESOLUTION = 1e-6
/** A peak of |dpH/dv| counts as an end point when it is this many times its lower flank… */
export const PEAK_RATIO = 3
/** …and the pH changes by at least this much between its two flanks. */
export const PEAK_RISE = 0.5
/** `titrate to pH` searches up to this many times the sample volume. */
export const MAX_DOSE_FACTOR = 1000
const BISECTIONS = 80

/** Moves the problem to added volume v (mL); returns why it cannot, or null. */
export function volumeSetter(model: Model, p: Problem): (vmL: number) => string | null {
  const t = model.titration!
  const V0 = t.sampleVolumeL
  const base = model.components.map((c) => c.value)
  return (vmL) => {
    if (!Number.isFinite(vmL) || vmL < 0) return `the added volume ${vmL} mL is not a volume`
    const v = vmL / 1000
    for (let j = 0; j < model.components.length; j++) {
      const c = model.components[j]
      if (c.mode !== 'total') continue
      const total = (V0 * base[j] + v * t.titrantTotals[j]) / (V0 + v)
      if (c.name !== 'H+' && total < 0) return `the total of ${c.name} would be negative`
      setComponent(p, j, 'total', Math.abs(total) < MIN_NONZERO_TOTAL ? 0 : total)
    }
    return null
  }
}

/** dpH/dv, pH units per mL, at a solved state and added volume v (mL). */
function slopeAt(model: Model, ws: Workspace, state: SolverState, vmL: number): number | null {
  const t = model.titration!
  const V0 = t.sampleVolumeL
  const v = vmL / 1000
  const rows = new Float64Array(ws.p.nc)
  model.components.forEach((c, j) => {
    if (c.mode !== 'total') return
    // F_j = Σν·c − T_j(v): ∂F_j/∂v = −dT_j/dv, per mL.
    rows[j] = -(V0 * (t.titrantTotals[j] - c.value)) / ((V0 + v) * (V0 + v)) / 1000
  })
  const d = dLogActivityH(ws, state, rows, 0)
  return d === null ? null : -d
}

function withBuffer(ws: Workspace, state: SolverState, result: Result): Result {
  result.bufferCapacity = bufferCapacity(ws, state)
  return result
}

/** The titration the model declares: its curve with end points, or the dose to a target pH. Never throws. */
export function titration(model: Model, options?: SolveOptions): TitrationResult {
  const t = model?.titration
  const sampleVolumeL = t?.sampleVolumeL ?? 0
  const unit = t?.unit ?? 'mL'
  const failedCurve = (reason: string): TitrationCurveResult => ({
    kind: 'titration', sampleVolumeL, unit, values: t?.values ?? [], points: (t?.values ?? [0]).map(() => unsolvable(model, reason)),
    derivative: (t?.values ?? [0]).map(() => null), equivalencePoints: [],
  })
  if (!t) return failedCurve('The model declares no titration.')
  try {
    const built = buildProblem(model)
    if ('error' in built) return t.values ? failedCurve(built.error) : dose(t.targetPH ?? 7, null, built.error)
    const p = built.problem
    const ws = new Workspace(p)
    const setVolume = volumeSetter(model, p)
    const guard = guardOf(options)
    const limits = { maxIterations: iterationsOf(options), ...guard }
    /** An exact solve at v (mL) from the warm start given; the state is left in `into`. */
    const solveAt = (v: number, warm: SolverState | null, into: SolverState): { result: Result; ok: boolean } => {
      const bad = setVolume(v)
      if (bad) return { result: unsolvable(model, `This titration point cannot be solved: ${bad}.`), ok: false }
      return solveProblem(ws, into, limits, warm ? [warm] : [])
    }
    const absentFromSample = () => model.components.some((c, j) => c.mode === 'total' && c.value === 0 && t.titrantTotals[j] !== 0)
    if (t.targetPH !== null) return doseTo(t.targetPH)
    return curve(t.values ?? [])

    function dose(pH: number, volume: number | null, reason: string | null, point: Result | null = null): TitrationDoseResult {
      return { kind: 'titration', sampleVolumeL, unit, target: { pH }, volume, point, ...(reason ? { reason } : {}) }
    }

    function doseTo(target: number): TitrationDoseResult {
      const state = newState(p)
      const lastGood = newState(p)
      const at0 = solveAt(0, null, state)
      if (!at0.ok) return dose(target, null, `The sample itself could not be solved: ${at0.result.reason}`)
      if (Math.abs(at0.result.pH - target) < 1e-9) return dose(target, 0, null, withBuffer(ws, state, at0.result))
      const sign0 = Math.sign(at0.result.pH - target)
      copyState(lastGood, state)
      // Bracket: doubling volumes from a thousandth of the sample.
      const V0mL = sampleVolumeL * 1000
      let lo = 0
      let hi = -1
      let pHlast = at0.result.pH
      for (let v = V0mL * 1e-3; v <= V0mL * MAX_DOSE_FACTOR * (1 + 1e-12); v *= 2) {
        const r = solveAt(v, lastGood, state)
        if (!r.ok) return dose(target, null, `The solution after ${formatMl(v)} of titrant could not be solved: ${r.result.reason}`)
        pHlast = r.result.pH
        if (Math.sign(r.result.pH - target) !== sign0) { hi = v; break }
        lo = v
        copyState(lastGood, state)
      }
      if (hi < 0) {
        return dose(target, null, `pH ${target} is not reachable with this titrant: the pH goes from ${at0.result.pH.toFixed(2)} (no titrant) to ${pHlast.toFixed(2)} after ${MAX_DOSE_FACTOR} times the sample volume, without crossing ${target}. Use a titrant that moves the pH the other way, or a stronger one.`)
      }
      // Bisection on exact solves, warm from the low side.
      const loState = newState(p)
      copyState(loState, lastGood)
      for (let k = 0; k < BISECTIONS && hi - lo > 1e-12 * hi; k++) {
        const mid = (lo + hi) / 2
        const r = solveAt(mid, loState, state)
        if (!r.ok) return dose(target, null, `The solution after ${formatMl(mid)} of titrant could not be solved: ${r.result.reason}`)
        if (Math.sign(r.result.pH - target) === sign0) { lo = mid; copyState(loState, state) } else hi = mid
        if (Math.abs(r.result.pH - target) < 1e-10) { lo = hi = mid; break }
      }
      const v = (lo + hi) / 2
      const r = solveAt(v, loState, state)
      if (!r.ok) return dose(target, null, `The solution after ${formatMl(v)} of titrant could not be solved: ${r.result.reason}`)
      return dose(target, Number(v.toPrecision(12)), null, withBuffer(ws, state, r.result))
    }

    function curve(values: number[]): TitrationCurveResult {
      const derivative: (number | null)[] = values.map(() => null)
      const states: (SolverState | null)[] = values.map(() => null)
      const points = continueAlong(ws, values, (v) => v, setVolume, options, 'titration', (i, state, result) => {
        result.bufferCapacity = bufferCapacity(ws, state)
        derivative[i] = slopeAt(model, ws, state, values[i])
        if (values[i] === 0 && absentFromSample()) {
          // A component only the titrant brings is absent at v = 0 and has no
          // equation there: the slope is taken from an exact solve just after.
          const tiny = sampleVolumeL * 1000 * 1e-9
          const after = newState(p)
          const r = solveAt(tiny, state, after)
          derivative[i] = r.ok ? slopeAt(model, ws, after, tiny) : null
        }
        const kept = newState(p)
        copyState(kept, state)
        states[i] = kept
      }, guard)
      const equivalencePoints: EquivalencePoint[] = []
      for (const i of endPointCandidates(values, points, derivative)) {
        const e = refine(values[i - 1], values[i + 1], states[i]!)
        if (e) equivalencePoints.push(e)
      }
      const answer: TitrationCurveResult = { kind: 'titration', sampleVolumeL, unit, values, points, derivative, equivalencePoints }
      if (model.limits?.length) {
        // Where each limit holds along the added volume, its ends located by exact solves warm from the nearest grid point.
        const scratch = newState(p)
        answer.limits = limitWindows(model, { variable: 'volume', component: null, values, points }, (v) => {
          let near = -1
          values.forEach((x, k) => { if (states[k] && (near < 0 || Math.abs(x - v) < Math.abs(values[near]! - v))) near = k })
          return solveAt(v, near >= 0 ? states[near]! : null, scratch).result
        })
      }
      // `uncertainty draws N`: the curve again with drawn constants, within most of what is left of the guard.
      const left = Math.max(0, guard.deadline - performance.now())
      const bands = model.monteCarlo ? monteCarloBands(model, Date.now() + MONTE_CARLO_SHARE * left, { maxIterations: options?.maxIterations }, (drawn, o) => bareCurve(drawn, values, o)) : null
      if (bands) points.forEach((point, i) => bands.attach(point, i))
      return answer
    }

    /** Golden-section search for the largest |dpH/dv| in [a, b], each value from an exact solve. */
    function refine(a: number, b: number, warm: SolverState): EquivalencePoint | null {
      const width = b - a
      const state = newState(p)
      const g = (v: number): number | null => {
        const r = solveAt(v, warm, state)
        if (!r.ok) return null
        const s = slopeAt(model, ws, state, v)
        return s === null ? null : Math.abs(s)
      }
      const phi = (Math.sqrt(5) - 1) / 2
      let x1 = b - phi * (b - a)
      let x2 = a + phi * (b - a)
      let g1 = g(x1)
      let g2 = g(x2)
      while (b - a > (END_POINT_RESOLUTION * width) / 2) {
        if (g1 === null || g2 === null) return null
        if (g1 > g2) { b = x2; x2 = x1; g2 = g1; x1 = b - phi * (b - a); g1 = g(x1) } else { a = x1; x1 = x2; g1 = g2; x2 = a + phi * (b - a); g2 = g(x2) }
      }
      const v = (a + b) / 2
      const r = solveAt(v, warm, state)
      if (!r.ok) return null
      return { volume: Number(v.toPrecision(10)), pH: r.result.pH }
    }
  } catch (error) {
    return t.values ? { ...failedCurve('') , points: (t.values).map(() => internalFailure(model, error)) } : { kind: 'titration', sampleVolumeL, unit, target: { pH: t.targetPH ?? 7 }, volume: null, point: null, reason: internalFailure(model, error).reason }
  }
}

const formatMl = (v: number) => `${Number(v.toPrecision(4))} mL`

/** The points of a titration curve and nothing else (no slopes, end points or limits): one Monte Carlo draw. */
export function bareCurve(model: Model, values: number[], options: SolveOptions): Result[] {
  const built = buildProblem(model)
  if ('error' in built) return values.map(() => unsolvable(model, built.error))
  const p = built.problem
  return continueAlong(new Workspace(p), values, (v) => v, volumeSetter(model, p), options, 'titration')
}

/**
 * Grid indices of end points: interior local maxima of |dpH/dv| whose
 * value is at least PEAK_RATIO times the larger of the lowest |dpH/dv| on
 * either side (up to the neighbouring maxima), with the pH changing by at
 * least PEAK_RISE between those two lowest points.
 */
export function endPointCandidates(values: number[], points: Result[], derivative: (number | null)[]): number[] {
  const n = values.length
  const d = derivative.map((x, i) => (x === null || !points[i]?.converged ? null : Math.abs(x)))
  const maxima: number[] = []
  for (let i = 1; i < n - 1; i++) {
    const [l, c, r] = [d[i - 1], d[i], d[i + 1]]
    if (l === null || c === null || r === null) continue
    if (c > l && c >= r) maxima.push(i)
  }
  const out: number[] = []
  maxima.forEach((i, k) => {
    const from = k > 0 ? maxima[k - 1] : 0
    const to = k < maxima.length - 1 ? maxima[k + 1] : n - 1
    const lowest = (a: number, b: number) => {
      let at = -1
      for (let q = a; q <= b; q++) if (d[q] !== null && (at < 0 || d[q]! < d[at]!)) at = q
      return at
    }
    const left = lowest(from, i - 1)
    const right = lowest(i + 1, to)
    if (left < 0 || right < 0) return
    const flank = Math.max(d[left]!, d[right]!)
    const rise = Math.abs(points[right].pH - points[left].pH)
    if (d[i]! >= PEAK_RATIO * flank && rise >= PEAK_RISE) out.push(i)
  })
  return out
}
