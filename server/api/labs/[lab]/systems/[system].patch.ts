import { eq } from 'drizzle-orm'
import { SystemParams, SystemUpdateBody } from '#shared/utils/lab-schemas'

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
  const revised = await db.transaction(async (tx) => {
    if (body.title !== undefined && body.title !== system.title) {
      await tx.update(tables.systems).set({ title: body.title }).where(eq(tables.systems.id, system.id))
      await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.rename', detail: { slug: system.slug, from: system.title, to: body.title } })
    }
    if (body.source === undefined) return null
    const revision = await addRevision(tx, {
      systemId: system.id,
      number: latest.number + 1,
      parentId: latest.id,
      source: body.source,
      authorId: user.id,
      message: body.message ?? '',
    })
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.revise', detail: { slug: system.slug, number: revision.number } })
    return revision
  }).catch(async (error) => {
    // Two saves from the same base at once: the unique (system, number) index lets one win.
    if (!isDuplicateKey(error)) throw error
    const winner = await findRevision(system.id, latest.number + 1)
    throw staleRevisionError(winner, await authorNameOf(winner), latest.number, body.source!)
  })
  let current = latest
  let authorName: string | null = null
  if (revised) {
    current = revised
    authorName = user.name
  } else if (latest.authorId) {
    const [author] = await db.select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.id, latest.authorId))
    authorName = author?.name ?? null
  }
  return { system: { slug: system.slug, title: body.title ?? system.title, isLibrary: system.isLibrary, latest: revisionView(current, authorName) } }
})
