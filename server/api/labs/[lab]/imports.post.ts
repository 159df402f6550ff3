/**
 * POST /api/labs/:lab/imports — an editor uploads a `.poise` file as a new
 * system (multipart: "file", optional "title" and "slug"). Without a title the
 * file's `system "…"` line names it; without a slug the title suggests one.
 */
import { LabParams, SlugSchema, TITLE_MAX_LENGTH } from '#shared/utils/lab-schemas'
import { ImportSystemFields, ImportedSystem } from '#shared/utils/upload-schemas'
import { suggestSlug } from '#shared/utils/slugs'
import { titleOf } from '#shared/poise/title'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'editor')
  const upload = await readPoiseUpload(event)
  const fields = validateFields(ImportSystemFields, upload.fields)
  // A title taken from the file (its `system` line or its name) is cut to fit; one sent was checked above.
  const title = fields.title || (titleOf(upload.source) || upload.filename.replace(/\.[^.]+$/, '')).slice(0, TITLE_MAX_LENGTH).trim()
  const slug = fields.slug ?? suggestSlug(title)
  if (!SlugSchema.safeParse(slug).success) {
    throw createError({ statusCode: 400, message: `slug: choose an address for the system (lower-case letters, digits and dashes); "${title}" does not give one`, data: { issues: [{ path: 'slug', message: 'Choose an address, for example rinse-tank' }] } })
  }
  // Everything stored is checked before anything is written.
  validateFields(ImportedSystem, { title, slug })
  const revision = await useDb().transaction(async (tx) => {
    const systemId = await insertSystem(tx, lab, { slug, title, createdBy: user.id })
    const first = await addRevision(tx, { systemId, number: 1, parentId: null, source: upload.source, authorId: user.id, message: `Imported from ${upload.filename}` })
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.import', detail: { slug, filename: upload.filename } })
    return first
  })
  setResponseStatus(event, 201)
  return { system: { slug, title, isLibrary: false, latest: revisionView(revision, user.name) } }
})
