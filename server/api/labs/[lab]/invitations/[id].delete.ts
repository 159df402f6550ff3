/** DELETE /api/labs/:lab/invitations/:id — an owner withdraws an invitation; its link stops working. */
import { and, eq, isNull } from 'drizzle-orm'
import { z } from 'zod'
import { SlugSchema } from '#shared/utils/lab-schemas'

export const Params = z.object({
  lab: SlugSchema,
  id: z.coerce.number({ error: 'Invitation must be a number' }).int().positive({ error: 'Invitation must be a positive number' }),
})

export default defineEventHandler(async (event) => {
  const params = validateParams(event, Params)
  const { lab, user } = await requireLabRole(event, params.lab, 'owner')
  await useDb().transaction(async (tx) => {
    // Marked, not deleted: a withdrawn invitation still counts against the hourly limit (limits.ts).
    const [result] = await tx.update(tables.invitations).set({ withdrawnAt: new Date() })
      .where(and(eq(tables.invitations.id, params.id), eq(tables.invitations.labId, lab.id), isNull(tables.invitations.withdrawnAt)))
    if (result.affectedRows !== 1) throw createError({ statusCode: 404, message: 'No such invitation in this lab' })
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'invitation.withdraw', detail: { invitationId: params.id } })
  })
  return { withdrawn: true }
})
