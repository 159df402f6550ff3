/** The answer of GET /api/labs/:lab/systems/:system/compare, read by the compare and review pages. */
import type { ModelChange } from '../diff/model-diff'
import type { ResultsDiff } from '../diff/results-diff'
import type { LabRole } from '../utils/roles'

export interface RevisionText { number: number, source: string, message: string, author: string | null, createdAt: string }

export interface CompareAnswer {
  lab: { slug: string, name: string }
  system: { slug: string, title: string }
  role: LabRole
  latestRevision: number
  from: RevisionText
  to: RevisionText
  modelDiff: ModelChange[] | null
  resultsDiff: ResultsDiff | null
  solved: { solverVersion: string } | null
  problems: string[]
}
