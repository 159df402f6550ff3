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
import { COMPILER_VERSION } from '../../shared/poise/version'
import { formatBytes } from '../../shared/utils/bytes'
import type { SolveTaskOutput } from '../workers/solve.worker'
import type { DbExecutor } from './db'

export function runStatusOf(output: SolveTaskOutput): RunStatus {
  return output.failedPoints === 0 ? 'ok' : 'diverged'
}

interface StoredOptions {
  kind?: AnswerKind
  libraries?: { name: string; revision: number }[]
  failedPoints?: number
}

/** The bytes a run row takes in the budget: counted when stored, measured for older rows. */
const runBytes = sql<number>`COALESCE(${tables.runs.storedBytes}, COALESCE(OCTET_LENGTH(${tables.runs.result}), 0) + COALESCE(OCTET_LENGTH(${tables.runs.model}), 0))`

export function runView(run: Omit<Run, 'model' | 'result'>, revisionNumber: number, createdBy: string | null, bytes: number): RunView {
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

/** Bytes the stored runs of a lab take. */
export async function labRunBytes(labId: number, db: DbExecutor = useDb()): Promise<number> {
  const [row] = await db.select({ used: sql<string | number | null>`SUM(${runBytes})` })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .innerJoin(tables.systems, eq(tables.systems.id, tables.revisions.systemId))
    .where(eq(tables.systems.labId, labId))
  return Number(row?.used ?? 0)
}

export async function labRunStorage(labId: number): Promise<RunStorage> {
  return { usedBytes: await labRunBytes(labId), budgetBytes: runStorageBudgetBytes() }
}

function overBudget(used: number, budget: number, needed: number | null): never {
  const wanted = needed === null ? '' : `, and this run needs ${formatBytes(needed)} more`
  throw createError({
    statusCode: 409,
    message: `This lab's stored runs use ${formatBytes(used)} of its ${formatBytes(budget)} run storage budget${wanted}. `
      + 'Delete old runs from the system\'s history (editors and owners can), or ask the site administrator to raise the budget. '
      + 'A preview (Run with unsaved edits) is never stored and still works.',
    data: { usedBytes: used, budgetBytes: budget, neededBytes: needed },
  })
}

/** Refuse (409) before solving when the lab's budget is already spent. */
export async function requireRunStorageRoom(labId: number): Promise<void> {
  const budget = runStorageBudgetBytes()
  const used = await labRunBytes(labId)
  if (used >= budget) overBudget(used, budget, null)
}

/**
 * Store a run with the model it solved. The lab row is locked while its
 * stored bytes are summed and the run inserted, so two runs at once cannot
 * both squeeze under the budget.
 */
export async function storeRun(labId: number, revision: Revision, userId: number, output: SolveTaskOutput, model: Model): Promise<Run> {
  const modelJson = JSON.stringify(model)
  const bytes = Buffer.byteLength(modelJson) + output.resultBytes.byteLength
  const budget = runStorageBudgetBytes()
  const db = useDb()
  const id = await db.transaction(async (tx) => {
    await tx.select({ id: tables.labs.id }).from(tables.labs).where(eq(tables.labs.id, labId)).for('update')
    const used = await labRunBytes(labId, tx)
    if (used + bytes > budget) overBudget(used, budget, bytes)
    // Runs count per system; the lab row lock above keeps two runs from taking one number.
    await tx.update(tables.systems).set({ lastRunNumber: sql`${tables.systems.lastRunNumber} + 1` }).where(eq(tables.systems.id, revision.systemId))
    const [counter] = await tx.select({ number: tables.systems.lastRunNumber }).from(tables.systems).where(eq(tables.systems.id, revision.systemId))
    const [inserted] = await tx.insert(tables.runs).values({
      revisionId: revision.id,
      number: counter!.number,
      solverVersion: output.solverVersion,
      compilerVersion: COMPILER_VERSION,
      options: { kind: output.kind, libraries: model.libraries, failedPoints: output.failedPoints },
      model: modelJson,
      result: output.resultJson,
      storedBytes: bytes,
      status: runStatusOf(output),
      timingMs: Math.round(output.elapsedMs),
      createdBy: userId,
    }).$returningId()
    return inserted!.id
  })
  const [row] = await db.select().from(tables.runs).where(eq(tables.runs.id, id))
  return row!
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
