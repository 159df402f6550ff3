/**
 * The answers of the lab membership, invitation and library routes, as the
 * server builds them and the members, invitation, library and review pages
 * read them. Defined once here; the routes declare them as their return type.
 */
import type { LabRole } from '../utils/roles'

/** A member of a lab with their role. */
export interface LabMemberView {
  id: number
  name: string
  email: string
  role: LabRole
}

/** GET /api/labs/:lab/members */
export interface MemberListAnswer {
  members: LabMemberView[]
  /** The role of the one asking. */
  myRole: LabRole
}

export type InvitationState = 'pending' | 'accepted' | 'expired'

/** An invitation as the lab's owners see it (never its link). */
export interface InvitationView {
  id: number
  email: string
  role: LabRole
  state: InvitationState
  expiresAt: string
  createdAt: string
}

/** GET /api/labs/:lab/invitations */
export interface InvitationListAnswer {
  invitations: InvitationView[]
}

/** POST /api/labs/:lab/invitations and POST /api/labs/:lab/members */
export interface InvitationSentAnswer {
  invitation: InvitationView
  /** Whether the mail went out. */
  mailed: boolean
}

/** GET /api/invitations/:token — what an invitation link offers. */
export interface InvitationOffer {
  lab: { slug: string; name: string }
  email: string
  role: LabRole
  /** The name of the one who invited, or null once their account is gone. */
  invitedBy: string | null
  expiresAt: string
}

/** POST /api/invitations/accept — the lab joined and the role taken. */
export interface InvitationAcceptedAnswer {
  lab: { slug: string; name: string }
  role: LabRole
}

/** POST /api/invitations/register — as accept, with the account made and signed in. */
export interface InvitationRegisteredAnswer extends InvitationAcceptedAnswer {
  user: { id: number; email: string; name: string; isAdmin: boolean }
}

/** A system of the lab whose latest revision uses a library. */
export interface LibraryUse {
  slug: string
  title: string
  /** The system's latest revision, whose text holds the `use`. */
  revision: number
  /** The revision it asks for, or null for "the latest". */
  pinned: number | null
  /** The library revision its newest run used, if it has run since. */
  lastRunUsed: number | null
}

/** PUT /api/labs/:lab/systems/:system/library — a system marked as a library, or no longer. */
export interface LibraryMarkAnswer {
  system: { slug: string; title: string; isLibrary: boolean; latestRevision: number }
}

/** GET /api/labs/:lab/libraries/:name */
export interface LibraryAnswer {
  library: { name: string; title: string; latestRevision: number }
  revisions: { number: number; message: string; author: string | null; createdAt: string }[]
  usedBy: LibraryUse[]
}
