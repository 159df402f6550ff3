/**
 * DELETE /api/labs/:lab/systems/:system/runs/:run — delete a stored run to
 * free the lab's run storage (editors and up, RUN_DELETE_ROLE). The revision
 * and its text stay; the deletion is audit-logged. Answers the lab's storage
 * after the deletion.
 */
import { and, eq } from 'drizzle-orm'
import { z } from 'zod'
import { RUN_DELETE_ROLE } from '#shared/utils/run-rules'

export const Params = z.object({ lab: z.string().min(1), system: z.string().min(1), run: z.coerce.number().int().positive() })

export default defineEventHandler(async (event) => {
  const { lab, system, run: runId } = validateParams(event, Params)
  const access = await requireSystem(event, lab, system, RUN_DELETE_ROLE)
  const db = useDb()
  const [row] = await db.select({ id: tables.runs.id, number: tables.revisions.number })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .where(and(eq(tables.runs.id, runId), eq(tables.revisions.systemId, access.system.id)))
  if (!row) throw createError({ statusCode: 404, message: `No run ${runId} of this system` })
  await db.transaction(async (tx) => {
    await tx.delete(tables.runs).where(eq(tables.runs.id, row.id))
    await recordAudit(tx, { actorId: access.user.id, labId: access.lab.id, action: 'run.delete', detail: { system: access.system.slug, run: row.id, revision: row.number } })
  })
  return { deleted: row.id, storage: await labRunStorage(access.lab.id) }
})
