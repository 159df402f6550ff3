import { eq } from 'drizzle-orm'
import { PasswordChangeBody } from '#shared/utils/account-schemas'
import type { PasswordChangedAnswer } from '#shared/types/account'

/**
 * Change one's own password; the current one must be given again. Every
 * other session of the account ends (a thief's copy of a cookie among them);
 * the one that made the change stays signed in.
 */
export default defineEventHandler(async (event): Promise<PasswordChangedAnswer> => {
  const user = await requireBrowserUser(event, 'change the password')
  const body = await validateBody(event, PasswordChangeBody)
  const db = useDb()
  const [row] = await db.select({ passwordHash: tables.users.passwordHash }).from(tables.users).where(eq(tables.users.id, user.id))
  if (!row || !(await verifyPassword(row.passwordHash, body.currentPassword))) {
    throw createError({ statusCode: 400, message: 'currentPassword: The current password is not correct', data: { issues: [{ path: 'currentPassword', message: 'The current password is not correct' }] } })
  }
  const passwordHash = await hashPassword(body.newPassword)
  const otherSessionsEnded = await db.transaction(async (tx) => {
    await tx.update(tables.users).set({ passwordHash }).where(eq(tables.users.id, user.id))
    const ended = await endOtherSessions(user.id, event, tx)
    await recordAudit(tx, { actorId: user.id, labId: null, action: 'user.password-change', detail: { otherSessionsEnded: ended } })
    return ended
  })
  return { changed: true, otherSessionsEnded }
})
