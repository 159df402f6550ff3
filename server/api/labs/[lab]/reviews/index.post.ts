/**
 * POST /api/labs/:lab/reviews — an editor asks a member with the reviewer
 * role or higher to review revision `to` of a system against revision `from`.
 * The reviewer gets a mail with the link.
 */
import { z } from 'zod'
import { and, eq } from 'drizzle-orm'
import { LabParams, SlugSchema } from '#shared/utils/lab-schemas'
import { labRoleAtLeast } from '#shared/utils/roles'

const Revision = z.number({ error: 'Give a revision number' }).int().positive({ error: 'Revision numbers start at 1' })
export const Body = z.object({
  system: SlugSchema,
  from: Revision,
  to: Revision,
  reviewerId: z.number({ error: 'Choose who should review' }).int().positive(),
  note: z.string().trim().max(2000, { error: 'Use at most 2000 characters' }).optional(),
}).refine(b => b.from !== b.to, { error: 'Choose two different revisions to compare', path: ['to'] })

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  await requireLabRole(event, params.lab, 'editor')
  const body = await validateBody(event, Body)
  const { system, user, lab } = await requireSystem(event, params.lab, body.system, 'editor')
  const [from, to] = await Promise.all([findRevision(system.id, body.from), findRevision(system.id, body.to)])
  if (body.reviewerId === user.id) {
    throw createError({ statusCode: 400, message: 'Ask someone else: a review is by another member than the one who asks', data: { issues: [{ path: 'reviewerId', message: 'Choose another member' }] } })
  }
  const [member] = await useDb().select({ role: tables.labMembers.role, name: tables.users.name })
    .from(tables.labMembers)
    .innerJoin(tables.users, eq(tables.users.id, tables.labMembers.userId))
    .where(and(eq(tables.labMembers.labId, lab.id), eq(tables.labMembers.userId, body.reviewerId)))
  if (!member) {
    throw createError({ statusCode: 400, message: 'The reviewer must be a member of this lab', data: { issues: [{ path: 'reviewerId', message: 'Choose a member of this lab' }] } })
  }
  if (!labRoleAtLeast(member.role, 'reviewer')) {
    throw createError({ statusCode: 400, message: `${member.name} is a ${member.role} here; choose a member with the reviewer role or higher`, data: { issues: [{ path: 'reviewerId', message: 'Choose a reviewer, editor or owner' }] } })
  }
  const [same] = await useDb().select({ id: tables.reviews.id }).from(tables.reviews).where(and(
    eq(tables.reviews.fromRevisionId, from.id), eq(tables.reviews.toRevisionId, to.id),
    eq(tables.reviews.reviewerId, body.reviewerId), eq(tables.reviews.state, 'open'),
  ))
  if (same) {
    throw createError({ statusCode: 409, message: `${member.name} already has this review open (review ${same.id}); add a comment there instead`, data: { reviewId: same.id } })
  }
  const reviewId = await useDb().transaction(async (tx) => {
    const [inserted] = await tx.insert(tables.reviews).values({
      labId: lab.id,
      systemId: system.id,
      fromRevisionId: from.id,
      toRevisionId: to.id,
      requestedBy: user.id,
      reviewerId: body.reviewerId,
      note: body.note ?? '',
    }).$returningId()
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'review.request', detail: { id: inserted!.id, slug: system.slug, from: from.number, to: to.number, reviewerId: body.reviewerId } })
    return inserted!.id
  })
  const review = await findReview(lab.id, reviewId)
  await mailReviewRequested(review, user.name)
  setResponseStatus(event, 201)
  return { review }
})
