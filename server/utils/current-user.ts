/**
 * Authentication: the session cookie says which session this is; the
 * sessions table says whether it still stands (not signed out, not past its
 * lifetimes, see sessions.ts); the account row says who the user is now
 * (deleted accounts and the admin flag).
 *
 * A request with `Authorization: Bearer <API token>` is authenticated by the
 * token instead (api-tokens.ts), with the same account and so the same lab
 * roles; a cookie sent beside it is ignored. A `read` token is refused (403)
 * on any method but GET and HEAD; `requireBrowserUser` refuses tokens
 * altogether for what only the signed-in person may do.
 */
import type { H3Event } from 'h3'
import { eq, sql } from 'drizzle-orm'
import { sessionEndMessage, sessionEndReason } from './session-lifetime'
import { authenticateBearer, hasBearer, type TokenAuth } from './api-tokens'

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

const READ_METHODS = new Set(['GET', 'HEAD'])

async function requireTokenUser(event: H3Event): Promise<CurrentUser> {
  // A refused token is refused once per request: the body-limit middleware and the route both ask.
  if (event.context.apiTokenRefusal) throw event.context.apiTokenRefusal
  try {
    return await checkTokenUser(event)
  } catch (error) {
    event.context.apiTokenRefusal = error
    throw error
  }
}

async function checkTokenUser(event: H3Event): Promise<CurrentUser> {
  const { userId, token } = await authenticateBearer(event)
  const [row] = await useDb().select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, isAdmin: tables.users.isAdmin })
    .from(tables.users).where(eq(tables.users.id, userId))
  if (!row) throw createError({ statusCode: 401, message: 'The account of this API token no longer exists' })
  event.context.apiToken = token
  if (token.scope === 'read' && !READ_METHODS.has(event.method)) {
    throw createError({ statusCode: 403, message: 'This API token may only read; make a token with the write scope on the settings page to change things' })
  }
  event.context.currentUser = row
  return row
}

/** The API token that authenticated this request, if one did. */
export function requestToken(event: H3Event): TokenAuth | undefined {
  return event.context.apiToken as TokenAuth | undefined
}

/** The signed-in user (by cookie or API token), or a 401 saying why they must sign in (again). */
export async function requireUser(event: H3Event): Promise<CurrentUser> {
  const cached = event.context.currentUser as CurrentUser | undefined
  if (cached) return cached
  if (hasBearer(event)) return requireTokenUser(event)
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

/**
 * The user signed in with the browser's cookie: managing API tokens and
 * sessions, changing the password and administering the site are refused
 * (403) to an API token, so a leaked token cannot take the account over.
 */
export async function requireBrowserUser(event: H3Event, what: string): Promise<CurrentUser> {
  if (hasBearer(event)) {
    await requireUser(event)
    throw createError({ statusCode: 403, message: `An API token cannot ${what}; sign in on the website to do that` })
  }
  return requireUser(event)
}
