/** GET /api/labs/:lab/systems/:system/runs/:run — one run with its stored result and the model it solved (null for runs stored before models were). */
import { and, eq } from 'drizzle-orm'
import { z } from 'zod'

export const Params = z.object({ lab: z.string().min(1), system: z.string().min(1), run: z.coerce.number().int().positive() })

export default defineEventHandler(async (event) => {
  const { lab, system, run: runId } = validateParams(event, Params)
  const access = await requireSystem(event, lab, system, 'viewer')
  const [row] = await useDb()
    .select({ run: tables.runs, number: tables.revisions.number, author: tables.users.name })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .leftJoin(tables.users, eq(tables.users.id, tables.runs.createdBy))
    .where(and(eq(tables.runs.id, runId), eq(tables.revisions.systemId, access.system.id)))
  if (!row) throw createError({ statusCode: 404, message: `No run ${runId} of this system` })
  return sendRunWithResult(event, row.run, row.number, row.author)
})
