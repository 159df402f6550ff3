import { eq } from 'drizzle-orm'
import { SystemParams, SystemUpdateBody } from '#shared/utils/lab-schemas'
import type { Revision } from '../../../../database/schema'
import type { Transaction } from '../../../../utils/db'

/**
 * An editor renames a system and/or saves a new source as the next revision.
 * A source edited from an older revision than the latest is refused (409) so
 * nobody overwrites a colleague's save without seeing it; the 409 carries the
 * latest revision's text and the text sent (`data.latest`, `data.yourSource`).
 */
export default defineEventHandler(async (event) => {
  const params = validateParams(event, SystemParams)
  const { system, latest, user, lab } = await requireSystem(event, params.lab, params.system, 'editor')
  const body = await validateBody(event, SystemUpdateBody)
  const db = useDb()
  if (body.source !== undefined && body.baseRevision !== latest.number) {
    throw staleRevisionError(latest, await authorNameOf(latest), body.baseRevision!, body.source)
  }
  // The rename, the new revision and their audit lines commit together or not at all.
  const rename = async (tx: Transaction) => {
    if (body.title === undefined || body.title === system.title) return
    await tx.update(tables.systems).set({ title: body.title }).where(eq(tables.systems.id, system.id))
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.rename', detail: { slug: system.slug, from: system.title, to: body.title } })
  }
  let revised: Revision | null = null
  if (body.source === undefined) await db.transaction(rename)
  else {
    revised = await writeNextRevision(
      { systemId: system.id, latest, source: body.source, authorId: user.id, message: body.message ?? '' },
      async (tx, revision) => {
        await rename(tx)
        await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.revise', detail: { slug: system.slug, number: revision.number } })
      },
    )
  }
  const current = revised ?? latest
  const authorName = revised ? user.name : await authorNameOf(latest)
  return { system: { slug: system.slug, title: body.title ?? system.title, isLibrary: system.isLibrary, latest: revisionView(current, authorName) } }
})
