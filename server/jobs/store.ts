/**
 * The run row as a job, in MariaDB: what a worker reads and writes, without
 * Nitro (the worker process only has the database and Redis URLs). Every
 * change of a job's status is guarded in SQL (`WHERE job_status IN
 * ('queued','running')`), so a job ends once: two workers that both think
 * they hold it (one stalled, not dead) cannot both store an answer.
 */
import { and, asc, eq, inArray, sql } from 'drizzle-orm'
import type { Database } from '../database/connect'
import * as tables from '../database/schema'
import { ACTIVE_JOB_STATUSES } from '../../shared/types/job'
import { formatBytes } from '../../shared/utils/bytes'
import { decodeBinaryAnswer, encodeBinaryAnswer } from '../../shared/results/binary-answer'
import type { PointParts } from '../../shared/results/sweep-columns'
import type { Slice, StoredPart } from './studies'

type Executor = Database | Parameters<Parameters<Database['transaction']>[0]>[0]

const active = inArray(tables.runs.jobStatus, [...ACTIVE_JOB_STATUSES])

/** The words of a refusal for a lab over its run storage budget (the route's 409 and a job's failure). */
export function budgetMessage(used: number, budget: number, needed: number | null): string {
  const wanted = needed === null ? '' : `, and this run needs ${formatBytes(needed)} more`
  return `This lab's stored runs use ${formatBytes(used)} of its ${formatBytes(budget)} run storage budget${wanted}. `
    + 'Delete old runs from the system\'s history (editors and owners can), or ask the site administrator to raise the budget. '
    + 'A preview (Run with unsaved edits) is never stored and still works.'
}

/** The bytes a run row takes in the budget: counted when stored, measured for older rows. */
export const runBytes = sql<number>`COALESCE(${tables.runs.storedBytes}, COALESCE(OCTET_LENGTH(${tables.runs.result}), 0) + COALESCE(OCTET_LENGTH(${tables.runs.model}), 0))`

/** Bytes the stored runs of a lab take. */
export async function labRunBytes(labId: number, db: Executor): Promise<number> {
  const [row] = await db.select({ used: sql<string | number | null>`SUM(${runBytes})` })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .innerJoin(tables.systems, eq(tables.systems.id, tables.revisions.systemId))
    .where(eq(tables.systems.labId, labId))
  return Number(row?.used ?? 0)
}

export interface ClaimedJob {
  model: string
  kind: string
  pointsTotal: number
  labId: number
  cancelRequested: boolean
}

/** Marks the job running on `worker` (again, when taken up after a stall); null when it already ended or was deleted. */
export async function claimJob(db: Database, runId: number, worker: string): Promise<ClaimedJob | null> {
  const [result] = await db.update(tables.runs)
    .set({ jobStatus: 'running', startedAt: sql`COALESCE(${tables.runs.startedAt}, NOW(3))`, worker })
    .where(and(eq(tables.runs.id, runId), active))
  if (!(result as { affectedRows: number }).affectedRows) return null
  const [row] = await db.select({
    model: tables.runs.model, options: tables.runs.options, pointsTotal: tables.runs.pointsTotal,
    cancelRequestedAt: tables.runs.cancelRequestedAt, labId: tables.systems.labId,
  }).from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .innerJoin(tables.systems, eq(tables.systems.id, tables.revisions.systemId))
    .where(eq(tables.runs.id, runId))
  if (!row?.model) return null
  return {
    model: row.model,
    kind: (row.options as { study?: string, kind?: string }).study ?? (row.options as { kind?: string }).kind ?? 'single',
    pointsTotal: row.pointsTotal,
    labId: row.labId,
    cancelRequested: row.cancelRequestedAt !== null,
  }
}

/** The slices stored so far, in order. */
export async function storedSlices(db: Executor, runId: number) {
  return db.select({ firstPoint: tables.runParts.firstPoint, pointCount: tables.runParts.pointCount, failedPoints: tables.runParts.failedPoints })
    .from(tables.runParts).where(eq(tables.runParts.runId, runId)).orderBy(asc(tables.runParts.firstPoint))
}

/** Points stored so far, over all ranges. */
export async function storedCount(db: Executor, runId: number): Promise<number> {
  return (await storedSlices(db, runId)).reduce((sum, part) => sum + part.pointCount, 0)
}

/** Where the next slice of the range [from, to) starts: after the points of that range stored so far, from its start on. */
export async function nextPoint(db: Executor, runId: number, from: number, to: number): Promise<number> {
  let next = from
  for (const part of await storedSlices(db, runId)) {
    if (part.firstPoint === next && next < to) next += part.pointCount
  }
  return next
}

/**
 * Stores a slice that starts at `from`, with the progress it makes:
 * `complete` when it was the last of the run's points, `refused` (nothing
 * stored) when the job has ended or another worker already stored some of
 * these points.
 */
export async function saveSlice(db: Database, runId: number, from: number, slice: Slice): Promise<'saved' | 'complete' | 'refused'> {
  return db.transaction(async (tx) => {
    const [run] = await tx.select({ jobStatus: tables.runs.jobStatus, pointsTotal: tables.runs.pointsTotal }).from(tables.runs).where(eq(tables.runs.id, runId)).for('update')
    if (!run || !(ACTIVE_JOB_STATUSES as readonly string[]).includes(run.jobStatus)) return 'refused'
    const parts = await storedSlices(tx, runId)
    if (slice.count > 0) {
      const end = from + slice.count
      if (parts.some((part) => part.firstPoint < end && part.firstPoint + part.pointCount > from)) return 'refused'
      await tx.insert(tables.runParts).values({ runId, firstPoint: from, pointCount: slice.count, failedPoints: slice.failed, body: sliceBody(slice) })
    }
    const stored = parts.reduce((sum, part) => sum + part.pointCount, 0) + slice.count
    await tx.update(tables.runs).set({ pointsDone: sql`GREATEST(${tables.runs.pointsDone}, ${stored})` }).where(eq(tables.runs.id, runId))
    return stored >= run.pointsTotal ? 'complete' : 'saved'
  })
}

/**
 * A slice as its row's body: a divisible kind's columns in the binary form
 * (shared/results/binary-answer.ts) as base64 text, a whole answer as its
 * JSON text. The two never look alike: JSON starts with { or [, base64
 * never does.
 */
export function sliceBody(slice: Slice): string {
  if (slice.columns) return Buffer.from(encodeBinaryAnswer(slice.columns)).toString('base64')
  return slice.answer ?? ''
}

/** A stored body back as a part of `count` points (sliceBody's inverse; JSON text is kept as text). */
export function partOfBody(body: string, count: number): StoredPart {
  const first = body.charCodeAt(0)
  if (first === 0x7b || first === 0x5b) return { count, text: body }
  const bytes = Buffer.from(body, 'base64')
  return { count, columns: decodeBinaryAnswer<PointParts>(bytes.buffer, bytes.byteOffset, bytes.byteLength) }
}

/**
 * The slices stored from the first point on without a gap, in order (what
 * `StudyRunner.finish` joins): all of them once every range is done; for a
 * cancelled run whose ranges stopped part-way, those before the first gap.
 */
export async function storedParts(db: Executor, runId: number): Promise<{ parts: StoredPart[], points: number, failed: number }> {
  const rows = await db.select({ firstPoint: tables.runParts.firstPoint, pointCount: tables.runParts.pointCount, body: tables.runParts.body, failedPoints: tables.runParts.failedPoints })
    .from(tables.runParts).where(eq(tables.runParts.runId, runId)).orderBy(asc(tables.runParts.firstPoint))
  const parts: StoredPart[] = []
  let points = 0
  let failed = 0
  for (const row of rows) {
    if (row.firstPoint !== points) break
    parts.push(partOfBody(row.body, row.pointCount))
    points += row.pointCount
    failed += row.failedPoints
  }
  return { parts, points, failed }
}

/**
 * Records progress while a slice runs (the points stored over all ranges
 * plus `inSlice` of this one; never going back), and answers whether
 * someone asked to cancel or the job already ended.
 */
export async function recordProgress(db: Database, runId: number, inSlice: number): Promise<{ stop: boolean }> {
  const stored = sql`(SELECT COALESCE(SUM(${tables.runParts.pointCount}), 0) FROM ${tables.runParts} WHERE ${tables.runParts.runId} = ${runId})`
  await db.update(tables.runs).set({ pointsDone: sql`LEAST(${tables.runs.pointsTotal}, GREATEST(${tables.runs.pointsDone}, ${stored} + ${inSlice}))` })
    .where(and(eq(tables.runs.id, runId), eq(tables.runs.jobStatus, 'running')))
  const [row] = await db.select({ jobStatus: tables.runs.jobStatus, cancelRequestedAt: tables.runs.cancelRequestedAt })
    .from(tables.runs).where(eq(tables.runs.id, runId))
  return { stop: !row || row.jobStatus !== 'running' || row.cancelRequestedAt !== null }
}

export interface JobEnd {
  jobStatus: 'done' | 'cancelled'
  resultJson: string | null
  failedPoints: number
  pointsDone: number
  solverVersion: string
  budgetBytes: number
  labId: number
}

/**
 * Writes a job's answer once, in one transaction: the lab row is locked
 * while its stored bytes are summed (two jobs cannot both squeeze under the
 * budget), the run's status moves from queued/running only, and its slices
 * go. A job over the budget fails saying so. Answers what the job became, or
 * null when it had already ended.
 */
export async function endJob(db: Database, runId: number, end: JobEnd): Promise<'done' | 'cancelled' | 'failed' | null> {
  return db.transaction(async (tx) => {
    await tx.select({ id: tables.labs.id }).from(tables.labs).where(eq(tables.labs.id, end.labId)).for('update')
    const [run] = await tx.select({ jobStatus: tables.runs.jobStatus, modelBytes: sql<number>`OCTET_LENGTH(${tables.runs.model})`, options: tables.runs.options })
      .from(tables.runs).where(eq(tables.runs.id, runId)).for('update')
    if (!run || !(ACTIVE_JOB_STATUSES as readonly string[]).includes(run.jobStatus)) return null
    const bytes = Number(run.modelBytes ?? 0) + Buffer.byteLength(end.resultJson ?? '')
    const used = await labRunBytes(end.labId, tx) - Number(run.modelBytes ?? 0)
    const finished = { finishedAt: sql`NOW(3)`, timingMs: sql`GREATEST(0, TIMESTAMPDIFF(MICROSECOND, COALESCE(${tables.runs.startedAt}, NOW(3)), NOW(3)) DIV 1000)` }
    if (used + bytes > end.budgetBytes) {
      await tx.update(tables.runs).set({ ...finished, jobStatus: 'failed', status: 'failed', jobError: budgetMessage(used, end.budgetBytes, bytes), storedBytes: Number(run.modelBytes ?? 0) })
        .where(and(eq(tables.runs.id, runId), active))
      await tx.delete(tables.runParts).where(eq(tables.runParts.runId, runId))
      return 'failed'
    }
    const [updated] = await tx.update(tables.runs).set({
      ...finished,
      jobStatus: end.jobStatus,
      result: end.resultJson,
      storedBytes: bytes,
      status: end.resultJson === null ? null : end.failedPoints === 0 ? 'ok' : 'diverged',
      solverVersion: end.solverVersion,
      // A cancelled run keeps the points before its first gap: its progress says how many.
      pointsDone: end.jobStatus === 'cancelled' ? end.pointsDone : sql`GREATEST(${tables.runs.pointsDone}, ${end.pointsDone})`,
      options: { ...(run.options as object), failedPoints: end.failedPoints },
    }).where(and(eq(tables.runs.id, runId), active))
    if (!(updated as { affectedRows: number }).affectedRows) return null
    await tx.delete(tables.runParts).where(eq(tables.runParts.runId, runId))
    return end.jobStatus
  })
}

/** Ends a job that cannot go on, saying why in words for the user; false when it had already ended. */
export async function failJob(db: Database, runId: number, message: string): Promise<boolean> {
  return db.transaction(async (tx) => {
    const [result] = await tx.update(tables.runs)
      .set({ jobStatus: 'failed', status: 'failed', jobError: message.slice(0, 1000), finishedAt: sql`NOW(3)` })
      .where(and(eq(tables.runs.id, runId), active))
    if (!(result as { affectedRows: number }).affectedRows) return false
    await tx.delete(tables.runParts).where(eq(tables.runParts.runId, runId))
    return true
  })
}

/**
 * Cancels a job that no worker has started: it ends at once, with nothing
 * computed. False when a worker holds it (it then stops at its next point,
 * seeing `cancel_requested_at`) or it already ended.
 */
export async function cancelQueuedJob(db: Database, runId: number): Promise<boolean> {
  const [result] = await db.update(tables.runs)
    .set({ jobStatus: 'cancelled', finishedAt: sql`NOW(3)` })
    .where(and(eq(tables.runs.id, runId), eq(tables.runs.jobStatus, 'queued'), sql`NOT EXISTS (SELECT 1 FROM run_parts WHERE run_parts.run_id = ${runId})`))
  return Boolean((result as { affectedRows: number }).affectedRows)
}
