/** GET /api/labs/:lab/invitations — the lab's invitations, newest first (owners). */
import { and, desc, eq, isNull } from 'drizzle-orm'
import { LabParams } from '#shared/utils/lab-schemas'
import type { InvitationListAnswer } from '#shared/types/lab'

export default defineEventHandler(async (event): Promise<InvitationListAnswer> => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'owner')
  const rows = await useDb().select().from(tables.invitations)
    .where(and(eq(tables.invitations.labId, lab.id), isNull(tables.invitations.withdrawnAt)))
    .orderBy(desc(tables.invitations.id))
    .limit(200)
  return { invitations: rows.map(invitationView) }
})
