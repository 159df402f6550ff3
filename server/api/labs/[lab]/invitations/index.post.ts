/**
 * POST /api/labs/:lab/invitations — an owner invites an e-mail address with a
 * role; the link goes out by mail. `mailed: false` tells the owner the mail
 * server did not take it (the invitation still exists and can be revoked).
 */
import { and, eq } from 'drizzle-orm'
import { LabParams } from '#shared/utils/lab-schemas'
import { InvitationCreateBody } from '#shared/utils/invitation-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'owner')
  const body = await validateBody(event, InvitationCreateBody)
  const db = useDb()
  const [member] = await db.select({ name: tables.users.name, role: tables.labMembers.role })
    .from(tables.labMembers)
    .innerJoin(tables.users, eq(tables.users.id, tables.labMembers.userId))
    .where(and(eq(tables.labMembers.labId, lab.id), eq(tables.users.email, body.email)))
  if (member) {
    throw createError({ statusCode: 409, message: `${member.name} (${body.email}) is already a member (${member.role}); change their role instead`, data: { issues: [{ path: 'email', message: `Already a member (${member.role})` }] } })
  }
  const { invitation, mailed } = await createInvitation(event, { lab, email: body.email, role: body.role, inviter: user })
  await recordAudit({ actorId: user.id, labId: lab.id, action: 'invitation.create', detail: { invitationId: invitation.id, email: body.email, role: body.role, mailed } })
  setResponseStatus(event, 201)
  return { invitation: invitationView(invitation), mailed }
})
