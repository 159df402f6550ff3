/**
 * The study kinds of stored runs: which kind a compiled model is, and how
 * many points it computes (progress, and the per-job limit of
 * SOLVE_LIMITS.maxJobPoints). Read by the web server when it queues a run
 * and by the workers; how each kind is computed is in studies.ts (the
 * solver stays out of the web server). A new kind (a map, a fit, a Monte
 * Carlo run) gets an entry here and a runner there; see DEVELOPERS.md,
 * "Study jobs".
 */
import type { Model } from '../../shared/poise/model'
import { SOLVE_LIMITS } from '../utils/solve-limits'

export interface StudyShape {
  /** The stored run's `kind` (RunView.kind); the key of its runner in STUDY_RUNNERS (studies.ts). */
  kind: string
  /** Whether a model is a study of this kind. */
  matches(model: Model): boolean
  /** How many points the study computes. */
  points(model: Model): number
  /**
   * Whether ranges of its points can be computed apart, each by another
   * worker at once (a sweep: yes, each range starting afresh; a titration:
   * no). Ranges start at a multiple of `align` points (a map: a row).
   */
  divisible?: { align(model: Model): number }
  /**
   * The kind of answer it stores (RunView.kind), when that is not `kind`: a
   * Monte Carlo run stores the sweep or titration it draws.
   */
  answerKind?(model: Model): string
  /** What its points are, for the progress line ("points" unless said). */
  unit?: 'points' | 'draws'
}

/** A sweep or a titration curve that asks for `uncertainty draws N` and has a constant with a ± to draw. */
function drawsConstants(model: Model): boolean {
  if (!model.monteCarlo || model.map) return false
  if (!model.sweep && !model.titration?.values) return false
  return model.reactions.some((r) => typeof r.logKUncertainty === 'number' && Number.isFinite(r.logKUncertainty) && r.logKUncertainty > 0)
}

/** Every kind, the most specific first: the first whose `matches` holds takes a model (a map model may carry a sweep too). */
export const STUDY_SHAPES: StudyShape[] = [
  // Its points are the draws; the study itself is solved once more at the end (finish).
  { kind: 'monte-carlo', matches: drawsConstants, points: (model) => model.monteCarlo?.draws ?? 0, answerKind: (model) => (model.titration ? 'titration' : 'sweep'), unit: 'draws' },
  { kind: 'map', matches: (model) => Boolean(model.map), points: (model) => (model.map?.x.values.length ?? 0) * (model.map?.y.values.length ?? 0), divisible: { align: (model) => model.map?.x.values.length ?? 1 } },
  { kind: 'titration', matches: (model) => Boolean(model.titration), points: (model) => Math.max(1, model.titration?.values?.length ?? 1) },
  { kind: 'sweep', matches: (model) => Boolean(model.sweep), points: (model) => model.sweep?.values.length ?? 0, divisible: { align: () => 1 } },
  { kind: 'single', matches: () => true, points: () => 1 },
]

export function studyShapeOf(model: Model): StudyShape {
  return STUDY_SHAPES.find((shape) => shape.matches(model))!
}

/** A range of a study's points, [from, to): what one job of the queue computes. */
export interface PointRange {
  from: number
  to: number
}

/**
 * The ranges a study is queued as: about SOLVE_LIMITS.jobSegmentPoints each
 * for a divisible kind (so several workers share one long study), else one.
 */
export function pointRanges(model: Model): PointRange[] {
  const shape = studyShapeOf(model)
  const total = shape.points(model)
  if (!shape.divisible || total <= SOLVE_LIMITS.jobSegmentPoints) return [{ from: 0, to: total }]
  const align = Math.max(1, Math.floor(shape.divisible.align(model)))
  const step = Math.max(align, Math.round(SOLVE_LIMITS.jobSegmentPoints / align) * align)
  const ranges: PointRange[] = []
  for (let from = 0; from < total; from += step) ranges.push({ from, to: Math.min(total, from + step) })
  return ranges
}

/**
 * The queue's priority of a range (1 first): by its size, so a small run
 * gets a worker before the next slice of a long one, and long ones take
 * turns among themselves.
 */
export function rangePriority(range: PointRange): number {
  return 1 + Math.ceil(Math.log2(range.to - range.from + 1))
}
