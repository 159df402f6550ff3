/**
 * POST /api/invitations/accept — the signed-in account joins the lab of the
 * invitation. The invitation names an address: only the account with that
 * address may use it, so a forwarded link does not let someone else in.
 */
import { InvitationAcceptBody } from '#shared/utils/invitation-schemas'
import type { InvitationAcceptedAnswer } from '#shared/types/lab'

export default defineEventHandler(async (event): Promise<InvitationAcceptedAnswer> => {
  const user = await requireUser(event)
  const { token } = await validateBody(event, InvitationAcceptBody)
  const open = await findOpenInvitation(token)
  if (open.invitation.email !== user.email.toLowerCase()) {
    throw createError({ statusCode: 403, message: `This invitation is for ${open.invitation.email}, and you are signed in as ${user.email}; sign out and sign in (or create an account) with ${open.invitation.email}` })
  }
  const role = await useDb().transaction(async (tx) => {
    const role = await acceptInvitation(tx, open, user.id)
    await recordAudit(tx, { actorId: user.id, labId: open.lab.id, action: 'invitation.accept', detail: { invitationId: open.invitation.id, role } })
    return role
  })
  return { lab: { slug: open.lab.slug, name: open.lab.name }, role }
})
