/**
 * POST /api/labs/:lab/systems/:system/runs/:run/cancel — stop a queued or
 * running run. A queued run ends at once; a running one stops within about a
 * second and keeps the points it computed, marked `cancelled`. Who started
 * the run may cancel it, and editors and up (RUN_DELETE_ROLE) any run.
 * Answers the run as it is now (its `jobStatus` turns `cancelled` once the
 * worker has stopped); 409 when it had already ended.
 */
import { and, eq, getTableColumns } from 'drizzle-orm'
import { z } from 'zod'
import { RUN_DELETE_ROLE, RUN_STORE_ROLE } from '#shared/utils/run-rules'
import { labRoleAtLeast } from '#shared/utils/roles'

export const Params = z.object({ lab: z.string().min(1), system: z.string().min(1), run: z.coerce.number().int().positive() })

export default defineEventHandler(async (event) => {
  const { lab, system, run: runId } = validateParams(event, Params)
  const access = await requireSystem(event, lab, system, RUN_STORE_ROLE)
  const db = useDb()
  const [row] = await db.select({
    run: { createdBy: tables.runs.createdBy, jobStatus: tables.runs.jobStatus, model: tables.runs.model },
    number: tables.revisions.number, author: tables.users.name,
  })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .leftJoin(tables.users, eq(tables.users.id, tables.runs.createdBy))
    .where(and(eq(tables.runs.id, runId), eq(tables.revisions.systemId, access.system.id)))
  if (!row) throw createError({ statusCode: 404, message: `No run ${runId} of this system` })
  if (row.run.createdBy !== access.user.id && !labRoleAtLeast(access.role, RUN_DELETE_ROLE)) {
    throw createError({ statusCode: 403, message: `Only who started run ${runId}, or a member with the ${RUN_DELETE_ROLE} role, may cancel it.` })
  }
  if (!await cancelRun(runId, JSON.parse(row.run.model ?? '{}'))) {
    throw createError({ statusCode: 409, message: `Run ${runId} has already ended (${row.run.jobStatus}); there is nothing to cancel.`, data: { jobStatus: row.run.jobStatus } })
  }
  const { result: _result, model: _model, ...now } = getTableColumns(tables.runs)
  const [after] = await db.select(now).from(tables.runs).where(eq(tables.runs.id, runId))
  return runView(after!, row.number, row.author, after!.storedBytes ?? 0)
})
