/**
 * Stored runs as jobs on the study queue (server/jobs/): the web server
 * writes the run row (queued, with the model to solve) and adds its job to
 * the queue on Redis; a worker process computes it. Fair use is checked
 * here, before anything is queued: points per job and jobs per account
 * (SOLVE_LIMITS), the lab's run storage budget.
 */
import type { H3Event } from 'h3'
import { and, eq, inArray, sql } from 'drizzle-orm'
import { Queue } from 'bullmq'
import type { Revision, Run } from '../database/schema'
import type { Model } from '../../shared/poise/model'
import { COMPILER_VERSION } from '../../shared/poise/version'
import { ACTIVE_JOB_STATUSES } from '../../shared/types/job'
import { jobIdOf, redisConnection, STUDY_QUEUE, type StudyJobData } from '../jobs/connection'
import { pointRanges, rangePriority, studyShapeOf } from '../jobs/kinds'
import { cancelQueuedJob, failJob, labRunBytes } from '../jobs/store'
import { SOLVE_LIMITS } from './solve-limits'

let queue: Queue<StudyJobData> | null = null

function studyQueue(): Queue<StudyJobData> {
  queue ??= new Queue<StudyJobData>(STUDY_QUEUE, { connection: redisConnection() })
  return queue
}

/** Jobs an account has queued or running. */
export async function activeJobsOf(userId: number, db: DbExecutor = useDb()): Promise<number> {
  const [row] = await db.select({ n: sql<number>`COUNT(*)` }).from(tables.runs)
    .where(and(eq(tables.runs.createdBy, userId), inArray(tables.runs.jobStatus, [...ACTIVE_JOB_STATUSES])))
  return Number(row?.n ?? 0)
}

/** A 422 when a model has more points than one job may compute. */
export function requireJobSize(model: Model): number {
  const shape = studyShapeOf(model)
  const points = shape.points(model)
  if (points > SOLVE_LIMITS.maxJobPoints) {
    throw createError({
      statusCode: 422,
      message: `This ${shape.kind} has ${points.toLocaleString('en-US')} points; one run may compute at most ${SOLVE_LIMITS.maxJobPoints.toLocaleString('en-US')}. Use fewer points or a larger step.`,
      data: { points, maxJobPoints: SOLVE_LIMITS.maxJobPoints },
    })
  }
  return points
}

function tooManyJobs(event: H3Event, held: number): never {
  refuseForNow(event, `You already have ${held} runs queued or running; at most ${SOLVE_LIMITS.jobsPerUser} at a time per account. Wait for one to finish or cancel one in the system's history.`, SOLVE_LIMITS.jobsRetryAfterSeconds)
}

/**
 * Queues a run of a saved revision for an account: refuses (422, 429, 409)
 * with a message when it is too large, the account has too many jobs, or
 * the lab's budget cannot hold even the model; otherwise writes the run row
 * (queued) and adds its job. Answers the row.
 */
export async function queueRun(event: H3Event, labId: number, revision: Revision, userId: number, model: Model): Promise<Run> {
  const pointsTotal = requireJobSize(model)
  const shape = studyShapeOf(model)
  // The answer's kind (what the workbench shows); the study kind, when another, picks the workers' runner.
  const kind = shape.answerKind?.(model) ?? shape.kind
  const modelJson = JSON.stringify(model)
  const modelBytes = Buffer.byteLength(modelJson)
  const budget = runStorageBudgetBytes()
  const db = useDb()
  // Lab, then account, locked while counted: two requests at once cannot both pass a limit.
  const outcome = await db.transaction(async (tx) => {
    await tx.select({ id: tables.labs.id }).from(tables.labs).where(eq(tables.labs.id, labId)).for('update')
    await tx.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, userId)).for('update')
    const held = await activeJobsOf(userId, tx)
    if (held >= SOLVE_LIMITS.jobsPerUser) return { held }
    const used = await labRunBytes(labId, tx)
    if (used + modelBytes > budget) return { used }
    // Runs count per system; the lab row lock above keeps two runs from taking one number.
    await tx.update(tables.systems).set({ lastRunNumber: sql`${tables.systems.lastRunNumber} + 1` }).where(eq(tables.systems.id, revision.systemId))
    const [counter] = await tx.select({ number: tables.systems.lastRunNumber }).from(tables.systems).where(eq(tables.systems.id, revision.systemId))
    const [inserted] = await tx.insert(tables.runs).values({
      revisionId: revision.id,
      number: counter!.number,
      solverVersion: '',
      compilerVersion: COMPILER_VERSION,
      options: { kind, ...(kind !== shape.kind ? { study: shape.kind } : {}), libraries: model.libraries, failedPoints: 0 },
      model: modelJson,
      result: null,
      storedBytes: modelBytes,
      status: null,
      createdBy: userId,
      jobStatus: 'queued',
      queuedAt: sql`NOW(3)`,
      pointsTotal,
    }).$returningId()
    const id = inserted!.id
    await tx.update(tables.runs).set({ jobId: jobIdOf(id) }).where(eq(tables.runs.id, id))
    return { id }
  })
  if ('held' in outcome) tooManyJobs(event, outcome.held!)
  if ('used' in outcome) overBudget(outcome.used!, budget, modelBytes)
  const id = outcome.id!
  // The run as queued (a worker may take it up at once once it is on the queue).
  const [row] = await db.select().from(tables.runs).where(eq(tables.runs.id, id))
  try {
    // A long divisible study goes on the queue as ranges of its points, which several workers compute at once.
    const ranges = pointRanges(model)
    await studyQueue().addBulk(ranges.map((range) => ({
      name: 'run',
      data: { runId: id, budgetBytes: budget, from: range.from, to: range.to, ranges: ranges.length },
      opts: { jobId: jobIdOf(id, range.from), priority: rangePriority(range), removeOnComplete: true, removeOnFail: 1000 },
    })))
  } catch (error) {
    console.error('[jobs] could not queue run', id, error)
    await failJob(db, id, 'The study queue could not be reached, so this run was not started. Try again shortly.')
    throw createError({ statusCode: 503, message: 'The study queue (Redis) cannot be reached, so the run was not started. Try again shortly; if it keeps failing, tell the site administrator.' })
  }
  return row!
}

/**
 * Asks a job to stop: a queued job ends at once (cancelled, nothing
 * computed); a running one stops at its next point and keeps the points it
 * computed. Answers false when the job had already ended.
 */
export async function cancelRun(runId: number, model: Model): Promise<boolean> {
  const db = useDb()
  const [asked] = await db.update(tables.runs).set({ cancelRequestedAt: sql`COALESCE(${tables.runs.cancelRequestedAt}, NOW(3))` })
    .where(and(eq(tables.runs.id, runId), inArray(tables.runs.jobStatus, [...ACTIVE_JOB_STATUSES])))
  if (!(asked as unknown as { affectedRows: number }).affectedRows) return false
  if (await cancelQueuedJob(db, runId)) {
    // No worker holds it: take it off the queue (a worker that takes it meanwhile finds it cancelled and does nothing).
    for (const range of pointRanges(model)) await studyQueue().remove(jobIdOf(runId, range.from)).catch(() => undefined)
  }
  return true
}
