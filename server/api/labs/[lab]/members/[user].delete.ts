import { and, eq } from 'drizzle-orm'
import { MemberParams } from '#shared/utils/lab-schemas'
import { wouldLeaveNoOwner } from '#shared/utils/roles'

/** An owner removes a member, or a member leaves; never the last owner. */
export default defineEventHandler(async (event) => {
  const params = validateParams(event, MemberParams)
  const { lab, user, role } = await requireLabRole(event, params.lab, 'viewer')
  const leaving = params.user === user.id
  if (!leaving && role !== 'owner') {
    throw createError({ statusCode: 403, message: `Removing members needs the owner role in ${lab.name}; you are ${role}` })
  }
  // The owner rows stay locked from the count to the commit, so two removals at once cannot leave no owner.
  await useDb().transaction(async (tx) => {
    const owners = await lockOwners(tx, lab.id)
    const current = await findMembership(tx, lab.id, params.user)
    if (wouldLeaveNoOwner(current.role, null, owners)) {
      throw createError({ statusCode: 409, message: LAST_OWNER_MESSAGE })
    }
    await tx.delete(tables.labMembers)
      .where(and(eq(tables.labMembers.labId, lab.id), eq(tables.labMembers.userId, params.user)))
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: leaving ? 'member.leave' : 'member.remove', detail: { userId: params.user } })
  })
  return { removed: params.user }
})
