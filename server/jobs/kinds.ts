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

export interface StudyShape {
  /** The stored run's `kind` (RunView.kind); the key of its runner in STUDY_RUNNERS (studies.ts). */
  kind: string
  /** Whether a model is a study of this kind. */
  matches(model: Model): boolean
  /** How many points the study computes. */
  points(model: Model): number
}

/** Every kind, the most specific first: the first whose `matches` holds takes a model (a map model may carry a sweep too). */
export const STUDY_SHAPES: StudyShape[] = [
  { kind: 'titration', matches: (model) => Boolean(model.titration), points: (model) => Math.max(1, model.titration?.values?.length ?? 1) },
  { kind: 'sweep', matches: (model) => Boolean(model.sweep), points: (model) => model.sweep?.values.length ?? 0 },
  { kind: 'single', matches: () => true, points: () => 1 },
]

export function studyShapeOf(model: Model): StudyShape {
  return STUDY_SHAPES.find((shape) => shape.matches(model))!
}
