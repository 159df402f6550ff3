/**
 * POST /api/labs/:lab/systems/:system/revisions/:number/restore — an editor
 * makes a new revision (latest + 1) whose text is that of revision :number.
 * Nothing is overwritten: the revisions in between stay in the history.
 * With `baseRevision`, a history page that is out of date gets a 409.
 */
import { z } from 'zod'

export const Body = z.object({
  baseRevision: z.number().int().positive().optional(),
  message: z.string().trim().max(500, { error: 'Use at most 500 characters' }).optional(),
})

export default defineEventHandler(async (event) => {
  const params = validateParams(event, RevisionParams)
  const { system, latest, user, lab } = await requireSystem(event, params.lab, params.system, 'editor')
  const body = await validateBody(event, Body)
  const old = await findRevision(system.id, params.number)
  if (body.baseRevision !== undefined && body.baseRevision !== latest.number) {
    throw staleRevisionError(latest, await authorNameOf(latest), body.baseRevision, old.source)
  }
  if (old.sha256 === latest.sha256) {
    throw createError({ statusCode: 400, message: `Revision ${old.number} has the same text as the latest revision ${latest.number}: there is nothing to restore` })
  }
  const restored = await writeNextRevision(
    { systemId: system.id, latest, source: old.source, authorId: user.id, message: body.message || `Restore revision ${old.number}` },
    (tx, next) => recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.restore', detail: { slug: system.slug, from: old.number, number: next.number } }),
  )
  setResponseStatus(event, 201)
  return { revision: { ...revisionView(restored, user.name), parent: latest.number } }
})
