/** The answer of GET /api/labs/:lab/systems/:system/compare, read by the compare and review pages. */
import type { ModelChange } from '../diff/model-diff'
import type { ResultsDiff } from '../diff/results-diff'
import type { CompareCurves } from '../diff/curves'
import type { LabRole } from '../utils/roles'

export interface RevisionText { number: number, source: string, message: string, author: string | null, createdAt: string }

/**
 * Where one side of a compare comes from. `stored`: the revision's newest
 * stored run; `solved-now`: it has none, so it was solved for this
 * comparison and not stored; `none`: no answer (it does not compile or
 * could not be solved; `problems` says why).
 */
export interface CompareSide {
  origin: 'stored' | 'solved-now' | 'none'
  runId: number | null
  /** The stored run's number within its system (null unless `stored`). */
  runNumber: number | null
  solverVersion: string | null
  /** The compiler version of the model; null for a run stored before models were. */
  compilerVersion: string | null
  /** `stored`: the model stored with the run; `compiled-now`: today's compile of the text. */
  model: 'stored' | 'compiled-now'
}

export interface CompareAnswer {
  lab: { slug: string, name: string }
  system: { slug: string, title: string }
  role: LabRole
  latestRevision: number
  from: RevisionText
  to: RevisionText
  modelDiff: ModelChange[] | null
  resultsDiff: ResultsDiff | null
  /** Both sides' sweep curves for one diagram; null unless both are sweeps over the same variable. */
  curves: CompareCurves | null
  /** `solverVersion` is the after side's; `from` and `to` say where each side's model and answer come from. */
  solved: { solverVersion: string | null, from: CompareSide, to: CompareSide } | null
  problems: string[]
}
