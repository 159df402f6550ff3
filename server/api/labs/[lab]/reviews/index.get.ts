/** GET /api/labs/:lab/reviews?system=slug&state=open — the lab's reviews, newest first. */
import { z } from 'zod'
import { and, eq } from 'drizzle-orm'
import { LabParams, SlugSchema } from '#shared/utils/lab-schemas'
import { REVIEW_STATES } from '../../../../database/schema'

const Query = z.object({
  system: SlugSchema.optional(),
  state: z.enum(REVIEW_STATES, { error: `state is one of ${REVIEW_STATES.join(', ')}` }).optional(),
})

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const query = Query.safeParse(getQuery(event))
  if (!query.success) throw createError({ statusCode: 400, message: query.error.issues[0]!.message })
  let systemId: number | undefined
  if (query.data.system) {
    const [system] = await useDb().select({ id: tables.systems.id }).from(tables.systems)
      .where(and(eq(tables.systems.labId, lab.id), eq(tables.systems.slug, query.data.system)))
    if (!system) throw createError({ statusCode: 404, message: `No system "${query.data.system}" in ${lab.name}` })
    systemId = system.id
  }
  return { reviews: await listLabReviews(lab.id, { systemId, state: query.data.state }) }
})
