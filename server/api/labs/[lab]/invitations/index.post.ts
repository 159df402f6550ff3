/**
 * POST /api/labs/:lab/invitations — an owner invites an e-mail address with a
 * role; the link goes out by mail. `mailed: false` tells the owner the mail
 * server did not take it (the invitation still exists and can be revoked).
 * 429 past INVITATIONS_PER_HOUR (server/utils/limits.ts).
 */
import { LabParams } from '#shared/utils/lab-schemas'
import { InvitationCreateBody } from '#shared/utils/invitation-schemas'
import type { InvitationSentAnswer } from '#shared/types/lab'

export default defineEventHandler(async (event): Promise<InvitationSentAnswer> => {
  const params = validateParams(event, LabParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'owner')
  const body = await validateBody(event, InvitationCreateBody)
  const { invitation, mailed } = await inviteToLab(event, { lab, email: body.email, role: body.role, inviter: user })
  setResponseStatus(event, 201)
  return { invitation: invitationView(invitation), mailed }
})
