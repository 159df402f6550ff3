/**
 * POST /api/labs/:lab/reviews/:id/decision — the member the review was asked
 * of approves it or asks for changes (and may change their mind later). The
 * member who asked can never decide their own request. The requester gets a
 * mail.
 */
import { z } from 'zod'
import { eq } from 'drizzle-orm'

export const Body = z.object({
  decision: z.enum(['approved', 'changes_requested'], { error: 'decision is "approved" or "changes_requested"' }),
  note: z.string().trim().max(2000, { error: 'Use at most 2000 characters' }).optional(),
})

export default defineEventHandler(async (event) => {
  const params = validateParams(event, ReviewParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'reviewer')
  const review = await findReview(lab.id, params.id)
  const body = await validateBody(event, Body)
  if (review.requester?.id === user.id) {
    throw createError({ statusCode: 403, message: 'You asked for this review, so you cannot decide it; the member you asked does' })
  }
  if (review.reviewer.id !== user.id) {
    throw createError({ statusCode: 403, message: `This review was asked of ${review.reviewer.name}; only they can approve it or ask for changes` })
  }
  await useDb().transaction(async (tx) => {
    await tx.update(tables.reviews)
      .set({ state: body.decision, decisionNote: body.note ?? '', decidedAt: new Date() })
      .where(eq(tables.reviews.id, review.id))
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'review.decide', detail: { id: review.id, decision: body.decision } })
  })
  const decided = await findReview(lab.id, review.id)
  await mailReviewDecided(decided)
  return { review: decided }
})
