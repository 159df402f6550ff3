/**
 * POST /api/labs/:lab/members (`email`, `role`) — an owner adds someone. People
 * join only through an invitation they accept, so this sends one (exactly as
 * POST …/invitations does) and answers the same whether or not the address
 * has an account: it never tells an owner who has one.
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
