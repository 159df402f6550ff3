import type { SessionsEndedAnswer } from '#shared/types/account'

/** DELETE /api/me/sessions — sign out every other session of the account; this one stays. */
export default defineEventHandler(async (event): Promise<SessionsEndedAnswer> => {
  const user = await requireBrowserUser(event, 'manage sessions')
  const ended = await useDb().transaction(async (tx) => {
    const ended = await endOtherSessions(user.id, event, tx)
    await recordAudit(tx, { actorId: user.id, labId: null, action: 'user.sign-out-others', detail: { ended } })
    return ended
  })
  return { ended }
})
