/** GET /api/me/sessions — this session and how many others the account has signed in elsewhere. */
import { and, desc, eq, ne } from 'drizzle-orm'
import type { SessionListAnswer } from '#shared/types/account'

export default defineEventHandler(async (event): Promise<SessionListAnswer> => {
  const user = await requireBrowserUser(event, 'manage sessions')
  const token = (await getUserSession(event)).secure!.token
  const others = await useDb().select({ lastSeenAt: tables.sessions.lastSeenAt, createdAt: tables.sessions.createdAt, userAgent: tables.sessions.userAgent })
    .from(tables.sessions)
    .where(and(eq(tables.sessions.userId, user.id), ne(tables.sessions.tokenHash, hashToken(token))))
    .orderBy(desc(tables.sessions.lastSeenAt))
  const lifetimes = sessionLifetimes(event)
  const now = Date.now()
  const alive = others.filter((s) => sessionEndReason(s, now, lifetimes) === null)
  return {
    lifetimes,
    others: alive.map((s) => ({ signedInAt: s.createdAt.toISOString(), lastSeenAt: s.lastSeenAt.toISOString(), userAgent: s.userAgent })),
  }
})
