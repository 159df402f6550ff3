import { and, eq } from 'drizzle-orm'
import { MemberParams, MemberUpdateBody } from '#shared/utils/lab-schemas'
import { wouldLeaveNoOwner } from '#shared/utils/roles'

/** An owner changes a member's role; the last owner cannot step down. */
export default defineEventHandler(async (event) => {
  const params = validateParams(event, MemberParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'owner')
  const body = await validateBody(event, MemberUpdateBody)
  // As for removal: the owner rows stay locked from the count to the commit.
  await useDb().transaction(async (tx) => {
    const owners = await lockOwners(tx, lab.id)
    const current = await findMembership(tx, lab.id, params.user)
    if (wouldLeaveNoOwner(current.role, body.role, owners)) {
      throw createError({ statusCode: 409, message: LAST_OWNER_MESSAGE })
    }
    await tx.update(tables.labMembers).set({ role: body.role })
      .where(and(eq(tables.labMembers.labId, lab.id), eq(tables.labMembers.userId, params.user)))
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'member.role', detail: { userId: params.user, from: current.role, to: body.role } })
  })
  return { member: { id: params.user, role: body.role } }
})
