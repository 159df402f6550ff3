/**
 * Runs: a saved revision solved by a given solver version. The result is
 * stored as JSON text so that a past answer can be shown (and compared)
 * exactly as it was computed.
 */
import type { H3Event } from 'h3'
import { desc, eq, and } from 'drizzle-orm'
import type { Revision, Run } from '../database/schema'
import type { AnswerKind, Result, SweepResult, TitrationResult } from '../../shared/types/result'
import type { SolveTaskOutput } from '../workers/solve.worker'

export type RunStatus = 'ok' | 'failed' | 'diverged'

export function runStatusOf(output: SolveTaskOutput): RunStatus {
  return output.failedPoints === 0 ? 'ok' : 'diverged'
}

export interface RunView {
  id: number
  revision: number
  status: RunStatus
  kind: AnswerKind
  solverVersion: string
  timingMs: number
  createdAt: string
  createdBy: string | null
  failedPoints: number
  libraries: { name: string; revision: number }[]
  result?: Result | SweepResult | TitrationResult
}

interface StoredOptions {
  kind?: AnswerKind
  libraries?: { name: string; revision: number }[]
  failedPoints?: number
}

export function runView(run: Run, revisionNumber: number, createdBy: string | null): RunView {
  const options = (run.options ?? {}) as StoredOptions
  const view: RunView = {
    id: run.id,
    revision: revisionNumber,
    status: run.status,
    kind: options.kind ?? 'single',
    solverVersion: run.solverVersion,
    timingMs: run.timingMs,
    createdAt: run.createdAt.toISOString(),
    createdBy,
    failedPoints: options.failedPoints ?? 0,
    libraries: options.libraries ?? [],
  }
  return view
}

/** A run with its stored result, sent without parsing the (possibly large) result JSON. */
export function sendRunWithResult(event: H3Event, run: Run, revisionNumber: number, createdBy: string | null): string {
  const view = runView(run, revisionNumber, createdBy) as unknown as Record<string, unknown>
  return sendJsonWithRaw(event, view, 'result', run.result ?? 'null')
}

export async function storeRun(revision: Revision, userId: number, output: SolveTaskOutput, libraries: { name: string; revision: number }[]): Promise<Run> {
  const db = useDb()
  const [inserted] = await db.insert(tables.runs).values({
    revisionId: revision.id,
    solverVersion: output.solverVersion,
    options: { kind: output.kind, libraries, failedPoints: output.failedPoints },
    result: output.resultJson,
    status: runStatusOf(output),
    timingMs: Math.round(output.elapsedMs),
    createdBy: userId,
  }).$returningId()
  const [row] = await db.select().from(tables.runs).where(eq(tables.runs.id, inserted!.id))
  return row!
}

/** The revision row with that number of a system, or a 404 that names it. */
export async function findRevision(systemId: number, number: number): Promise<Revision> {
  const [row] = await useDb().select().from(tables.revisions)
    .where(and(eq(tables.revisions.systemId, systemId), eq(tables.revisions.number, number)))
  if (!row) throw createError({ statusCode: 404, message: `This system has no revision ${number}` })
  return row
}

export async function listRuns(systemId: number, limit = 50): Promise<RunView[]> {
  const rows = await useDb()
    .select({ run: tables.runs, number: tables.revisions.number, author: tables.users.name })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .leftJoin(tables.users, eq(tables.users.id, tables.runs.createdBy))
    .where(eq(tables.revisions.systemId, systemId))
    .orderBy(desc(tables.runs.id))
    .limit(limit)
  return rows.map(r => runView(r.run, r.number, r.author))
}
