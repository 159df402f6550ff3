/** GET /api/labs/:lab/reviews?system=slug&state=open — the lab's reviews, newest first. */
import { z } from 'zod'
import { and, eq } from 'drizzle-orm'
import { LabParams, SlugSchema } from '#shared/utils/lab-schemas'
import { REVIEW_STATES, type ReviewListAnswer } from '#shared/types/review'

export const Query = z.object({
  system: SlugSchema.optional(),
  state: z.enum(REVIEW_STATES, { error: `state is one of ${REVIEW_STATES.join(', ')}` }).optional(),
})

export default defineEventHandler(async (event): Promise<ReviewListAnswer> => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const query = validateQuery(event, Query)
  let systemId: number | undefined
  if (query.system) {
    const [system] = await useDb().select({ id: tables.systems.id }).from(tables.systems)
      .where(and(eq(tables.systems.labId, lab.id), eq(tables.systems.slug, query.system)))
    if (!system) throw createError({ statusCode: 404, message: `No system "${query.system}" in ${lab.name}` })
    systemId = system.id
  }
  return { reviews: await listLabReviews(lab.id, { systemId, state: query.state }) }
})
