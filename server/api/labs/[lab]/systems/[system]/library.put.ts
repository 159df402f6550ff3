/**
 * PUT /api/labs/:lab/systems/:system/library — an editor marks a system as a
 * library (`{ isLibrary: true }`), so other systems of the lab can
 * `use "<its slug>"`, or takes the mark off. Past runs keep the library
 * revisions they recorded either way.
 */
import { eq } from 'drizzle-orm'
import { SystemParams } from '#shared/utils/lab-schemas'
import { LibraryMarkBody } from '#shared/utils/library-schemas'
import type { LibraryMarkAnswer } from '#shared/types/lab'

export default defineEventHandler(async (event): Promise<LibraryMarkAnswer> => {
  const params = validateParams(event, SystemParams)
  const { system, lab, user, latest } = await requireSystem(event, params.lab, params.system, 'editor')
  const { isLibrary } = await validateBody(event, LibraryMarkBody)
  if (isLibrary !== system.isLibrary) {
    await useDb().transaction(async (tx) => {
      await tx.update(tables.systems).set({ isLibrary }).where(eq(tables.systems.id, system.id))
      await recordAudit(tx, { actorId: user.id, labId: lab.id, action: isLibrary ? 'library.mark' : 'library.unmark', detail: { slug: system.slug } })
    })
  }
  return { system: { slug: system.slug, title: system.title, isLibrary, latestRevision: latest.number } }
})
