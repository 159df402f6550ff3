/**
 * POST /api/labs/:lab/systems/:system/imports — an editor uploads a `.poise`
 * file as the next revision (multipart: "file", optional "message" and
 * "baseRevision"). With baseRevision, a save made since is a 409 as for edits.
 */
import { SystemParams } from '#shared/utils/lab-schemas'
import { ImportRevisionFields } from '#shared/utils/upload-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, SystemParams)
  const { system, latest, user, lab } = await requireSystem(event, params.lab, params.system, 'editor')
  const upload = await readPoiseUpload(event)
  const fields = validateFields(ImportRevisionFields, upload.fields)
  if (fields.baseRevision !== undefined && fields.baseRevision !== latest.number) {
    throw staleRevisionError(latest, await authorNameOf(latest), fields.baseRevision, upload.source)
  }
  const revision = await writeNextRevision(
    { systemId: system.id, latest, source: upload.source, authorId: user.id, message: fields.message || `Imported from ${upload.filename}` },
    (tx, next) => recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.import', detail: { slug: system.slug, number: next.number, filename: upload.filename } }),
  )
  setResponseStatus(event, 201)
  return { system: { slug: system.slug, title: system.title, isLibrary: system.isLibrary, latest: revisionView(revision, user.name) } }
})
