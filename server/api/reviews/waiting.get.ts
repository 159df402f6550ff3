import type { ReviewsWaitingAnswer } from '#shared/types/review'

/** GET /api/reviews/waiting — open reviews asked of me, and the latest reviews I asked for (for the home page). */
export default defineEventHandler(async (event): Promise<ReviewsWaitingAnswer> => {
  const user = await requireUser(event)
  const [waiting, requested] = await Promise.all([reviewsWaitingFor(user.id), reviewsRequestedBy(user.id, 10)])
  return { waiting, requested }
})
