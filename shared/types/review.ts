/**
 * Reviews as the review routes answer them and the pages read them: one
 * member asks another (reviewer or higher) to review revision `to` of a
 * system against revision `from`. The states and their words are defined
 * here once, for the database schema, the routes, the mails and the pages.
 */
import type { LabRole } from '../utils/roles'

export const REVIEW_STATES = ['open', 'approved', 'changes_requested'] as const
export type ReviewState = (typeof REVIEW_STATES)[number]

/** Plain words for a review's state, as the pages and mails say it. */
export const REVIEW_STATE_WORDS: Record<ReviewState, string> = {
  open: 'waiting for review',
  approved: 'approved',
  changes_requested: 'changes requested',
}

export interface ReviewView {
  id: number
  lab: { slug: string; name: string }
  system: { slug: string; title: string }
  from: number
  to: number
  state: ReviewState
  note: string
  decisionNote: string
  decidedAt: string | null
  createdAt: string
  requester: { id: number; name: string } | null
  reviewer: { id: number; name: string; email: string }
}

export interface ReviewCommentView {
  id: number
  side: 'from' | 'to'
  line: number
  /** The text of the commented line (revisions never change, so it is the line as it was commented on). */
  quote: string
  body: string
  author: string | null
  createdAt: string
}

/** GET /api/labs/:lab/reviews */
export interface ReviewListAnswer {
  reviews: ReviewView[]
}

/** GET /api/reviews/waiting — open reviews asked of me, and the latest I asked for. */
export interface ReviewsWaitingAnswer {
  waiting: ReviewView[]
  requested: ReviewView[]
}

/** GET /api/labs/:lab/reviews/:id */
export interface ReviewAnswer {
  review: ReviewView
  comments: ReviewCommentView[]
  role: LabRole
  canComment: boolean
  canDecide: boolean
}
