/**
 * Runs: a saved revision solved and kept. Each run stores what it solved —
 * the compiled model (with the library revisions it used) and the compiler
 * and solver versions — beside the result, so a past answer is shown and
 * compared exactly as it was computed, whatever today's compiler or
 * libraries would make of the text. Runs stored before models were stored
 * have `model` null; readers say so and fall back to a recompile.
 *
 * Stored runs count against the lab's run storage budget
 * (`runStorageBudgetMb` in the runtime config).
 */
import type { H3Event } from 'h3'
import { desc, eq, and, sql } from 'drizzle-orm'
import type { Revision, Run } from '../database/schema'
import type { Model } from '../../shared/poise/model'
import type { AnswerKind } from '../../shared/types/result'
import type { RunStatus, RunStorage, RunView } from '../../shared/types/system'
import { jobIsActive, type JobProgress } from '../../shared/types/job'
import { budgetMessage, labRunBytes, runBytes } from '../jobs/store'
import { STUDY_SHAPES } from '../jobs/kinds'

interface StoredOptions {
  kind?: AnswerKind
  libraries?: { name: string; revision: number }[]
  failedPoints?: number
  /** The study kind (server/jobs/kinds.ts) when it is not `kind`: 'monte-carlo'. */
  study?: string
}

type RunColumns = Omit<Run, 'model' | 'result'>

/** Points done of total, time since a worker started it, and the time left at the rate so far. */
export function jobProgress(run: Pick<RunColumns, 'jobStatus' | 'pointsDone' | 'pointsTotal' | 'startedAt' | 'finishedAt'>, now = Date.now()): JobProgress {
  const total = run.pointsTotal
  const done = run.jobStatus === 'done' ? total : Math.min(run.pointsDone, total)
  const started = run.startedAt?.getTime()
  const elapsedMs = started === undefined ? 0 : Math.max(0, (run.finishedAt?.getTime() ?? now) - started)
  const remainingMs = jobIsActive(run.jobStatus) && started !== undefined && done > 0 ? Math.round(elapsedMs / done * (total - done)) : null
  return { done, total, elapsedMs, remainingMs }
}

/** The progress unit of a study kind that does not count points. */
function unitOf(study: string | undefined): { unit?: 'draws' } {
  return STUDY_SHAPES.find((shape) => shape.kind === study)?.unit === 'draws' ? { unit: 'draws' } : {}
}

export function runView(run: RunColumns, revisionNumber: number, createdBy: string | null, bytes: number): RunView {
  const options = (run.options ?? {}) as StoredOptions
  return {
    id: run.id,
    number: run.number,
    revision: revisionNumber,
    status: run.status,
    kind: options.kind ?? 'single',
    solverVersion: run.solverVersion,
    compilerVersion: run.compilerVersion,
    storedModel: run.compilerVersion !== null,
    storedBytes: Number(bytes),
    timingMs: run.timingMs,
    createdAt: run.createdAt.toISOString(),
    createdBy,
    failedPoints: options.failedPoints ?? 0,
    libraries: options.libraries ?? [],
    jobStatus: run.jobStatus,
    jobId: run.jobId,
    queuedAt: run.queuedAt?.toISOString() ?? null,
    startedAt: run.startedAt?.toISOString() ?? null,
    finishedAt: run.finishedAt?.toISOString() ?? null,
    worker: run.worker,
    progress: { ...jobProgress(run), ...unitOf(options.study) },
    jobError: run.jobError,
  }
}

/** A run with its stored result and model, sent without parsing the (possibly large) JSON. */
export function sendRunWithResult(event: H3Event, run: Run, revisionNumber: number, createdBy: string | null): string {
  const bytes = run.storedBytes ?? Buffer.byteLength(run.result ?? '') + Buffer.byteLength(run.model ?? '')
  const view = runView(run, revisionNumber, createdBy, bytes) as unknown as Record<string, unknown>
  return sendJsonWithRaws(event, view, { result: run.result ?? 'null', model: run.model ?? 'null' })
}

/** The lab's run storage budget in bytes (NUXT_RUN_STORAGE_BUDGET_MB, in megabytes of 1,000,000 bytes). */
export function runStorageBudgetBytes(): number {
  const mb = Number(useRuntimeConfig().runStorageBudgetMb)
  return Math.max(0, Number.isFinite(mb) ? mb : 0) * 1_000_000
}

export async function labRunStorage(labId: number): Promise<RunStorage> {
  return { usedBytes: await labRunBytes(labId, useDb()), budgetBytes: runStorageBudgetBytes() }
}

/** The 409 of a lab over its run storage budget, saying the use and what to do. */
export function overBudget(used: number, budget: number, needed: number | null): never {
  throw createError({
    statusCode: 409,
    message: budgetMessage(used, budget, needed),
    data: { usedBytes: used, budgetBytes: budget, neededBytes: needed },
  })
}

/** Refuse (409) before solving when the lab's budget is already spent. */
export async function requireRunStorageRoom(labId: number): Promise<void> {
  const budget = runStorageBudgetBytes()
  const used = await labRunBytes(labId, useDb())
  if (used >= budget) overBudget(used, budget, null)
}

/** The revision row with that number of a system, or a 404 that names it. */
export async function findRevision(systemId: number, number: number): Promise<Revision> {
  const [row] = await useDb().select().from(tables.revisions)
    .where(and(eq(tables.revisions.systemId, systemId), eq(tables.revisions.number, number)))
  if (!row) throw createError({ statusCode: 404, message: `This system has no revision ${number}` })
  return row
}

/** Run columns without the large JSON ones, for lists. */
const runSummaryColumns = {
  id: tables.runs.id,
  number: tables.runs.number,
  revisionId: tables.runs.revisionId,
  solverVersion: tables.runs.solverVersion,
  compilerVersion: tables.runs.compilerVersion,
  options: tables.runs.options,
  storedBytes: tables.runs.storedBytes,
  status: tables.runs.status,
  timingMs: tables.runs.timingMs,
  createdBy: tables.runs.createdBy,
  createdAt: tables.runs.createdAt,
  jobStatus: tables.runs.jobStatus,
  jobId: tables.runs.jobId,
  queuedAt: tables.runs.queuedAt,
  startedAt: tables.runs.startedAt,
  finishedAt: tables.runs.finishedAt,
  worker: tables.runs.worker,
  pointsDone: tables.runs.pointsDone,
  pointsTotal: tables.runs.pointsTotal,
  cancelRequestedAt: tables.runs.cancelRequestedAt,
  jobError: tables.runs.jobError,
}

export async function listRuns(systemId: number, limit = 50): Promise<RunView[]> {
  const rows = await useDb()
    .select({ run: runSummaryColumns, bytes: runBytes, revision: tables.revisions.number, author: tables.users.name })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .leftJoin(tables.users, eq(tables.users.id, tables.runs.createdBy))
    .where(eq(tables.revisions.systemId, systemId))
    .orderBy(desc(tables.runs.id))
    .limit(limit)
  return rows.map(r => runView(r.run, r.revision, r.author, r.bytes))
}
