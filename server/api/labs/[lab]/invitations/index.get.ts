/** GET /api/labs/:lab/invitations — the lab's invitations, newest first (owners). */
import { desc, eq } from 'drizzle-orm'
import { LabParams } from '#shared/utils/lab-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'owner')
  const rows = await useDb().select().from(tables.invitations)
    .where(eq(tables.invitations.labId, lab.id))
    .orderBy(desc(tables.invitations.id))
    .limit(200)
  return { invitations: rows.map(invitationView) }
})
