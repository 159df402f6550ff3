/**
 * Signed-in sessions. The sealed cookie (nuxt-auth-utils) holds the user and a
 * random session token; the sessions table holds the token's sha256, when the
 * session began and when it was last used. `requireUser` (current-user.ts)
 * accepts a cookie only while its row exists and is within the lifetimes, so
 * signing out, "sign out all other sessions", a password change and a reset
 * end sessions for good — a copied cookie stops working too.
 */
import type { H3Event } from 'h3'
import { and, eq, lt, ne, or } from 'drizzle-orm'
import { tables, useDb, type DbExecutor } from './db'
import { hashToken, newToken } from './tokens'
import type { SessionLifetimes } from '../../shared/types/account'
import { sessionLifetimesFrom } from './session-lifetime'

/** lastSeenAt is written at most this often per session, not on every request. */
export const LAST_SEEN_RESOLUTION_MS = 60_000

export function sessionLifetimes(event?: H3Event): SessionLifetimes {
  return sessionLifetimesFrom(useRuntimeConfig(event))
}

/** Starts a new session for the account (a fresh token; any previous session of this browser is replaced). */
export async function startSession(event: H3Event, user: { id: number, email: string, name: string }): Promise<void> {
  const { token, hash } = newToken()
  const userAgent = (getRequestHeader(event, 'user-agent') ?? '').slice(0, 200)
  await endSession(event, { keepCookie: true })
  const lifetimes = sessionLifetimes(event)
  const now = Date.now()
  const db = useDb()
  // Sessions of this account that ended unseen (a browser closed, never signed out) go now.
  await db.delete(tables.sessions).where(and(eq(tables.sessions.userId, user.id), or(
    lt(tables.sessions.lastSeenAt, new Date(now - lifetimes.idleMinutes * 60_000)),
    lt(tables.sessions.createdAt, new Date(now - lifetimes.absoluteMinutes * 60_000)),
  )))
  await db.insert(tables.sessions).values({ userId: user.id, tokenHash: hash, userAgent })
  const maxAge = Math.round(lifetimes.absoluteMinutes * 60)
  await replaceUserSession(event, { user, secure: { token }, loggedInAt: Date.now() }, { maxAge })
}

/** Ends this browser's session: its row goes (so a copy of the cookie is refused) and the cookie is cleared. */
export async function endSession(event: H3Event, options: { keepCookie?: boolean } = {}): Promise<void> {
  const session = await getUserSession(event)
  if (session.secure?.token) await useDb().delete(tables.sessions).where(eq(tables.sessions.tokenHash, hashToken(session.secure.token)))
  if (!options.keepCookie) await clearUserSession(event)
}

/**
 * Ends every session of the account except the one this request came with (all
 * of them when `event` is null), in the caller's transaction when given one.
 * Returns how many ended.
 */
export async function endOtherSessions(userId: number, event: H3Event | null, db: DbExecutor = useDb()): Promise<number> {
  const token = event ? (await getUserSession(event)).secure?.token : undefined
  const [result] = await db.delete(tables.sessions).where(token
    ? and(eq(tables.sessions.userId, userId), ne(tables.sessions.tokenHash, hashToken(token)))
    : eq(tables.sessions.userId, userId))
  return result.affectedRows
}
