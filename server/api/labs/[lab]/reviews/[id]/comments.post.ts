/**
 * POST /api/labs/:lab/reviews/:id/comments — a member with the reviewer role
 * or higher comments on one line of either side (`from` is the older
 * revision, `to` the newer).
 */
import { z } from 'zod'
import { eq } from 'drizzle-orm'

export const Body = z.object({
  side: z.enum(['from', 'to'], { error: 'side is "from" (the older revision) or "to" (the newer)' }),
  line: z.number({ error: 'Give the line number the comment is about' }).int().positive({ error: 'Lines are numbered from 1' }),
  body: z.string().trim().min(1, { error: 'Write a comment' }).max(5000, { error: 'Use at most 5000 characters' }),
})

export default defineEventHandler(async (event) => {
  const params = validateParams(event, ReviewParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'reviewer')
  const review = await findReview(lab.id, params.id)
  const body = await validateBody(event, Body)
  const [row] = await useDb().select({ revision: tables.reviews }).from(tables.reviews).where(eq(tables.reviews.id, review.id))
  const revision = await findRevisionById(body.side === 'from' ? row!.revision.fromRevisionId : row!.revision.toRevisionId)
  const lines = revision!.source.split('\n').length
  if (body.line > lines) {
    throw createError({ statusCode: 400, message: `Revision ${revision!.number} has ${lines} lines; choose a line from 1 to ${lines}`, data: { issues: [{ path: 'line', message: `Choose a line from 1 to ${lines}` }] } })
  }
  await useDb().transaction(async (tx) => {
    const [inserted] = await tx.insert(tables.reviewComments).values({ reviewId: review.id, authorId: user.id, side: body.side, line: body.line, body: body.body }).$returningId()
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'review.comment', detail: { id: review.id, comment: inserted!.id } })
  })
  setResponseStatus(event, 201)
  return { comments: await listComments(review.id) }
})
