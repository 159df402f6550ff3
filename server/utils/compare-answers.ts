/**
 * The solved answer of a revision for comparing: a stored run made by the
 * current solver version when there is one, else a fresh solve through the
 * pool, stored as a run so the next compare reuses it. Both sides of a
 * compare are therefore solved by the same solver version.
 */
import { and, desc, eq, isNotNull } from 'drizzle-orm'
import type { Revision } from '../database/schema'
import type { Model } from '../../shared/poise/model'
import type { SolvedAnswer } from '../../shared/diff/results-diff'
import { SOLVER_VERSION } from '../solver/index'

export interface RevisionAnswer {
  runId: number
  /** True when a stored run was reused rather than solved now. */
  reused: boolean
  solverVersion: string
  answer: SolvedAnswer
}

export async function answerForRevision(revision: Revision, model: Model, userId: number): Promise<RevisionAnswer> {
  const [stored] = await useDb().select().from(tables.runs)
    .where(and(eq(tables.runs.revisionId, revision.id), eq(tables.runs.solverVersion, SOLVER_VERSION), isNotNull(tables.runs.result)))
    .orderBy(desc(tables.runs.id))
    .limit(1)
  if (stored?.result) return { runId: stored.id, reused: true, solverVersion: stored.solverVersion, answer: JSON.parse(stored.result) as SolvedAnswer }
  const output = await solveInPool(model)
  const run = await storeRun(revision, userId, output, model.libraries)
  return { runId: run.id, reused: false, solverVersion: output.solverVersion, answer: JSON.parse(output.resultJson) as SolvedAnswer }
}
