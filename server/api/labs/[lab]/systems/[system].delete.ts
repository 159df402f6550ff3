import { eq } from 'drizzle-orm'
import { SystemParams } from '#shared/utils/lab-schemas'

/** An editor deletes a system with all its revisions and runs. */
export default defineEventHandler(async (event) => {
  const params = validateParams(event, SystemParams)
  const { system, user, lab } = await requireSystem(event, params.lab, params.system, 'editor')
  await useDb().transaction(async (tx) => {
    await tx.delete(tables.systems).where(eq(tables.systems.id, system.id))
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.delete', detail: { slug: system.slug, title: system.title } })
  })
  return { deleted: system.slug }
})
