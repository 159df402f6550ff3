/**
 * The answers of the account and administration routes (/api/me/…,
 * /api/admin/…), as the server builds them and the settings, home and
 * administration pages read them. Defined once here; the routes declare them
 * as their return type.
 */
import type { LabRole } from '../utils/roles'
import type { ApiTokenSummary } from '../utils/token-schemas'
import type { CapturedMail } from './mail'

/**
 * How long a session lasts: it ends after `idleMinutes` without a request and
 * `absoluteMinutes` after signing in, whichever comes first.
 */
export interface SessionLifetimes {
  idleMinutes: number
  absoluteMinutes: number
}

/** Another live session of the signed-in account. */
export interface OtherSession {
  signedInAt: string
  lastSeenAt: string
  userAgent: string
}

/** GET /api/me/sessions */
export interface SessionListAnswer {
  lifetimes: SessionLifetimes
  others: OtherSession[]
}

/** DELETE /api/me/sessions — how many other sessions were signed out. */
export interface SessionsEndedAnswer {
  ended: number
}

/** POST /api/auth/password — the password changed, and the other sessions signed out with it. */
export interface PasswordChangedAnswer {
  changed: true
  otherSessionsEnded: number
}

/** GET /api/me/tokens */
export interface ApiTokenListAnswer {
  tokens: ApiTokenSummary[]
}

/** One of my labs' systems, as the home page lists them. */
export interface RecentSystem {
  slug: string
  title: string
  lab: { slug: string; name: string }
  latestRevision: number | null
  savedAt: string | null
}

/** GET /api/me/recent-systems */
export interface RecentSystemsAnswer {
  systems: RecentSystem[]
}

/** An account as a site administrator sees it, with its labs. */
export interface AdminUserView {
  id: number
  name: string
  email: string
  isAdmin: boolean
  createdAt: string
  labs: { slug: string; name: string; role: LabRole }[]
}

/** GET /api/admin/users */
export interface AdminUserListAnswer {
  users: AdminUserView[]
}

/** GET /api/admin/mail */
export interface CapturedMailListAnswer {
  messages: CapturedMail[]
}
