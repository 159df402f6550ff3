/**
 * What a compare shows of each revision: the newest stored run (its stored
 * model and result, exactly as solved) when there is one, else the revision
 * compiled and solved now, in memory, for this comparison only. A compare
 * is a read: it never stores a run. Runs stored before models were stored
 * keep their stored answer; their model is compiled now, and the answer
 * says so.
 */
import { desc, eq, and, isNotNull } from 'drizzle-orm'
import type { Revision } from '../database/schema'
import type { Model } from '../../shared/poise/model'
import type { SolvedAnswer } from '../../shared/diff/results-diff'
import type { CompareSide } from '../../shared/types/compare'
import { COMPILER_VERSION } from '../../shared/poise/version'

export interface ComparedRevision {
  side: CompareSide
  /** The model the answer belongs to; null when the revision does not compile (then `answer` is null unless stored). */
  model: Model | null
  answer: SolvedAnswer | null
}

async function compiled(labId: number, revision: Revision, problems: string[]): Promise<Model | null> {
  try {
    return compileForSolve(revision.source, { resolveLibrary: await libraryResolverFor(labId, revision.source) }).model
  } catch (error) {
    problems.push(`Revision ${revision.number} cannot be solved: ${(error as { message?: string }).message ?? String(error)}`)
    return null
  }
}

export async function answerForRevision(labId: number, revision: Revision, userId: number, problems: string[]): Promise<ComparedRevision> {
  const [stored] = await useDb().select().from(tables.runs)
    .where(and(eq(tables.runs.revisionId, revision.id), eq(tables.runs.jobStatus, 'done'), isNotNull(tables.runs.result)))
    .orderBy(desc(tables.runs.id))
    .limit(1)
  if (stored?.result) {
    const answer = JSON.parse(stored.result) as SolvedAnswer
    if (stored.model) {
      return {
        side: { origin: 'stored', runId: stored.id, runNumber: stored.number, solverVersion: stored.solverVersion, compilerVersion: stored.compilerVersion, model: 'stored' },
        model: JSON.parse(stored.model) as Model,
        answer,
      }
    }
    problems.push(`Run ${stored.number} of revision ${revision.number} predates stored models: its answer is as stored, but its model (constants, conditions) is today's compile of its text, which may differ from what was solved.`)
    return {
      side: { origin: 'stored', runId: stored.id, runNumber: stored.number, solverVersion: stored.solverVersion, compilerVersion: null, model: 'compiled-now' },
      model: await compiled(labId, revision, problems),
      answer,
    }
  }
  const model = await compiled(labId, revision, problems)
  if (!model) {
    return { side: { origin: 'none', runId: null, runNumber: null, solverVersion: null, compilerVersion: COMPILER_VERSION, model: 'compiled-now' }, model: null, answer: null }
  }
  try {
    const output = await solveInPool(model, userId)
    return {
      side: { origin: 'solved-now', runId: null, runNumber: null, solverVersion: output.solverVersion, compilerVersion: COMPILER_VERSION, model: 'compiled-now' },
      model,
      answer: JSON.parse(output.resultJson) as SolvedAnswer,
    }
  } catch (error) {
    problems.push(`Revision ${revision.number} has no stored run and could not be solved now: ${(error as { message?: string }).message ?? String(error)}`)
    return { side: { origin: 'none', runId: null, runNumber: null, solverVersion: null, compilerVersion: COMPILER_VERSION, model: 'compiled-now' }, model, answer: null }
  }
}
