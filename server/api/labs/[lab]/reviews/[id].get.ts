/** GET /api/labs/:lab/reviews/:id — a review with its comments and what the caller may do with it. */
import { labRoleAtLeast } from '#shared/utils/roles'
import type { ReviewAnswer } from '#shared/types/review'

export default defineEventHandler(async (event): Promise<ReviewAnswer> => {
  const params = validateParams(event, ReviewParams)
  const { lab, role, user } = await requireLabRole(event, params.lab, 'viewer')
  const review = await findReview(lab.id, params.id)
  const canReview = labRoleAtLeast(role, 'reviewer')
  return {
    review,
    comments: await listComments(review.id),
    role,
    canComment: canReview,
    canDecide: canReview && review.reviewer.id === user.id,
  }
})
