/**
 * Reviews: a member (editor or higher) asks another member with the reviewer
 * role or higher to review revision `to` of a system against revision `from`.
 * The reviewer comments on lines of either side and approves or asks for
 * changes; both steps send a mail.
 */
import { and, asc, desc, eq, inArray, type SQL } from 'drizzle-orm'
import { alias } from 'drizzle-orm/mysql-core'
import { REVIEW_STATE_WORDS, type ReviewCommentView, type ReviewState, type ReviewView } from '../../shared/types/review'

async function selectReviews(where: SQL | undefined, limit = 200): Promise<ReviewView[]> {
  const requester = alias(tables.users, 'requester')
  const reviewer = alias(tables.users, 'reviewer')
  const fromRevision = alias(tables.revisions, 'from_revision')
  const toRevision = alias(tables.revisions, 'to_revision')
  const rows = await useDb()
    .select({
      review: tables.reviews,
      lab: { slug: tables.labs.slug, name: tables.labs.name },
      system: { slug: tables.systems.slug, title: tables.systems.title },
      from: fromRevision.number,
      to: toRevision.number,
      requesterName: requester.name,
      reviewer: { id: reviewer.id, name: reviewer.name, email: reviewer.email },
    })
    .from(tables.reviews)
    .innerJoin(tables.labs, eq(tables.labs.id, tables.reviews.labId))
    .innerJoin(tables.systems, eq(tables.systems.id, tables.reviews.systemId))
    .innerJoin(fromRevision, eq(fromRevision.id, tables.reviews.fromRevisionId))
    .innerJoin(toRevision, eq(toRevision.id, tables.reviews.toRevisionId))
    .innerJoin(reviewer, eq(reviewer.id, tables.reviews.reviewerId))
    .leftJoin(requester, eq(requester.id, tables.reviews.requestedBy))
    .where(where)
    .orderBy(desc(tables.reviews.id))
    .limit(limit)
  return rows.map(r => ({
    id: r.review.id,
    lab: r.lab,
    system: r.system,
    from: r.from,
    to: r.to,
    state: r.review.state,
    note: r.review.note,
    decisionNote: r.review.decisionNote,
    decidedAt: r.review.decidedAt?.toISOString() ?? null,
    createdAt: r.review.createdAt.toISOString(),
    requester: r.review.requestedBy !== null && r.requesterName !== null ? { id: r.review.requestedBy, name: r.requesterName } : null,
    reviewer: r.reviewer,
  }))
}

/** The reviews of a lab, newest first, optionally of one system and in one state. */
export function listLabReviews(labId: number, filter: { systemId?: number; state?: ReviewState } = {}): Promise<ReviewView[]> {
  const conditions = [eq(tables.reviews.labId, labId)]
  if (filter.systemId !== undefined) conditions.push(eq(tables.reviews.systemId, filter.systemId))
  if (filter.state) conditions.push(eq(tables.reviews.state, filter.state))
  return selectReviews(and(...conditions))
}

/** Open reviews asked of this user, in the labs they are still a member of. */
export async function reviewsWaitingFor(userId: number): Promise<ReviewView[]> {
  const labIds = (await useDb().select({ labId: tables.labMembers.labId }).from(tables.labMembers)
    .where(and(eq(tables.labMembers.userId, userId), inArray(tables.labMembers.role, ['reviewer', 'editor', 'owner']))))
    .map(r => r.labId)
  if (!labIds.length) return []
  return selectReviews(and(eq(tables.reviews.reviewerId, userId), eq(tables.reviews.state, 'open'), inArray(tables.reviews.labId, labIds)))
}

/** Reviews this user asked for in the labs they are still a member of, newest first. */
export async function reviewsRequestedBy(userId: number, limit: number): Promise<ReviewView[]> {
  const labIds = (await useDb().select({ labId: tables.labMembers.labId }).from(tables.labMembers).where(eq(tables.labMembers.userId, userId))).map(r => r.labId)
  if (!labIds.length) return []
  return selectReviews(and(eq(tables.reviews.requestedBy, userId), inArray(tables.reviews.labId, labIds)), limit)
}

/** One review of the lab, or a 404 (also for a review of another lab, so ids reveal nothing). */
export async function findReview(labId: number, id: number): Promise<ReviewView> {
  const [review] = await selectReviews(and(eq(tables.reviews.labId, labId), eq(tables.reviews.id, id)), 1)
  if (!review) throw createError({ statusCode: 404, message: `This lab has no review ${id}` })
  return review
}

/** The comments of a review in the order made, each quoting the line it is about (revisions never change, so the quote is read from the text). */
export async function listComments(reviewId: number): Promise<ReviewCommentView[]> {
  const fromRevision = alias(tables.revisions, 'from_revision')
  const toRevision = alias(tables.revisions, 'to_revision')
  const [sides] = await useDb()
    .select({ from: fromRevision.source, to: toRevision.source })
    .from(tables.reviews)
    .innerJoin(fromRevision, eq(fromRevision.id, tables.reviews.fromRevisionId))
    .innerJoin(toRevision, eq(toRevision.id, tables.reviews.toRevisionId))
    .where(eq(tables.reviews.id, reviewId))
  const lines = { from: (sides?.from ?? '').split('\n'), to: (sides?.to ?? '').split('\n') }
  const rows = await useDb()
    .select({ comment: tables.reviewComments, author: tables.users.name })
    .from(tables.reviewComments)
    .leftJoin(tables.users, eq(tables.users.id, tables.reviewComments.authorId))
    .where(eq(tables.reviewComments.reviewId, reviewId))
    .orderBy(asc(tables.reviewComments.id))
  return rows.map(({ comment, author }) => ({
    id: comment.id,
    side: comment.side,
    line: comment.line,
    quote: lines[comment.side][comment.line - 1] ?? '',
    body: comment.body,
    author,
    createdAt: comment.createdAt.toISOString(),
  }))
}

/** Mail the reviewer that a review waits for them. Never throws (see sendMail). */
export async function mailReviewRequested(review: ReviewView, requesterName: string): Promise<void> {
  const link = siteLink(`/labs/${review.lab.slug}/reviews/${review.id}`)
  await sendMail({
    to: review.reviewer.email,
    subject: `Review requested: ${review.system.title}, revision ${review.to} against ${review.from}`,
    text: [
      `${requesterName} asks you to review revision ${review.to} of "${review.system.title}" (${review.lab.name}) against revision ${review.from}.`,
      review.note ? `\nTheir note:\n${review.note}\n` : '',
      `Open the review: ${link}`,
    ].join('\n'),
  })
}

/** Mail the requester the reviewer's decision. Never throws (see sendMail). */
export async function mailReviewDecided(review: ReviewView): Promise<void> {
  if (!review.requester) return
  const [requester] = await useDb().select({ email: tables.users.email }).from(tables.users).where(eq(tables.users.id, review.requester.id))
  if (!requester) return
  const link = siteLink(`/labs/${review.lab.slug}/reviews/${review.id}`)
  await sendMail({
    to: requester.email,
    subject: `Review ${REVIEW_STATE_WORDS[review.state]}: ${review.system.title}, revision ${review.to}`,
    text: [
      `${review.reviewer.name} reviewed revision ${review.to} of "${review.system.title}" (${review.lab.name}) against revision ${review.from}: ${REVIEW_STATE_WORDS[review.state]}.`,
      review.decisionNote ? `\nTheir note:\n${review.decisionNote}\n` : '',
      `Open the review: ${link}`,
    ].join('\n'),
  })
}
