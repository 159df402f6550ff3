// nuxt-auth-utils' own /api/_auth/session routes go through the same checks as
// every other route: GET answers 401 for a session that has ended, and
// DELETE (sign out) ends the session's row, not only the cookie.
import { eq } from 'drizzle-orm'

export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (_session, event) => {
    await requireUser(event)
  })
  sessionHooks.hook('clear', async (session) => {
    const token = session.secure?.token
    if (token) await useDb().delete(tables.sessions).where(eq(tables.sessions.tokenHash, hashToken(token)))
  })
})
