/**
 * Authentication: the session cookie says which session this is; the
 * sessions table says whether it still stands (not signed out, not past its
 * lifetimes, see sessions.ts); the account row says who the user is now
 * (deleted accounts and the admin flag).
 */
import type { H3Event } from 'h3'
import { eq, sql } from 'drizzle-orm'
import { sessionEndMessage, sessionEndReason } from './session-lifetime'

export interface CurrentUser {
  id: number
  email: string
  name: string
  isAdmin: boolean
}

const SIGN_IN = 'Sign in to continue'

async function refuse(event: H3Event, message: string): Promise<never> {
  await clearUserSession(event)
  throw createError({ statusCode: 401, message })
}

/** The signed-in user, or a 401 saying why they must sign in (again). */
export async function requireUser(event: H3Event): Promise<CurrentUser> {
  const cached = event.context.currentUser as CurrentUser | undefined
  if (cached) return cached
  const session = await getUserSession(event)
  if (!session.user) throw createError({ statusCode: 401, message: SIGN_IN })
  if (!session.secure?.token) return refuse(event, 'Your session has ended; sign in again')
  const db = useDb()
  const [row] = await db
    .select({
      sessionId: tables.sessions.id, createdAt: tables.sessions.createdAt, lastSeenAt: tables.sessions.lastSeenAt,
      id: tables.users.id, email: tables.users.email, name: tables.users.name, isAdmin: tables.users.isAdmin,
    })
    .from(tables.sessions)
    .innerJoin(tables.users, eq(tables.users.id, tables.sessions.userId))
    .where(eq(tables.sessions.tokenHash, hashToken(session.secure.token)))
  if (!row || row.id !== session.user.id) return refuse(event, 'Your session has ended (signed out, here or from another session); sign in again')
  const now = Date.now()
  const lifetimes = sessionLifetimes(event)
  const ended = sessionEndReason(row, now, lifetimes)
  if (ended) {
    await db.delete(tables.sessions).where(eq(tables.sessions.id, row.sessionId))
    return refuse(event, sessionEndMessage(ended, lifetimes))
  }
  if (now - row.lastSeenAt.getTime() >= LAST_SEEN_RESOLUTION_MS) {
    await db.update(tables.sessions).set({ lastSeenAt: sql`CURRENT_TIMESTAMP(3)` }).where(eq(tables.sessions.id, row.sessionId))
  }
  const user: CurrentUser = { id: row.id, email: row.email, name: row.name, isAdmin: row.isAdmin }
  event.context.currentUser = user
  return user
}
