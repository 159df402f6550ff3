/**
 * POST /api/labs/:lab/imports — an editor uploads a `.poise` file as a new
 * system (multipart: "file", optional "title" and "slug"). Without a title the
 * file's `system "…"` line names it; without a slug the title suggests one.
 */
import { LabParams, SlugSchema } from '#shared/utils/lab-schemas'
import { ImportSystemFields } from '#shared/utils/upload-schemas'
import { suggestSlug } from '#shared/utils/slugs'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'editor')
  const upload = await readPoiseUpload(event)
  const fields = validateFields(ImportSystemFields, upload.fields)
  const title = fields.title || titleInSource(upload.source) || upload.filename.replace(/\.[^.]+$/, '')
  const slug = fields.slug ?? suggestSlug(title)
  if (!SlugSchema.safeParse(slug).success) {
    throw createError({ statusCode: 400, message: `slug: choose an address for the system (lower-case letters, digits and dashes); "${title}" does not give one`, data: { issues: [{ path: 'slug', message: 'Choose an address, for example rinse-tank' }] } })
  }
  const systemId = await insertSystem(lab, { slug, title: title.slice(0, 200), createdBy: user.id })
  const revision = await addRevision({ systemId, number: 1, parentId: null, source: upload.source, authorId: user.id, message: `Imported from ${upload.filename}`.slice(0, 500) })
  await recordAudit({ actorId: user.id, labId: lab.id, action: 'system.import', detail: { slug, filename: upload.filename } })
  setResponseStatus(event, 201)
  return { system: { slug, title, isLibrary: false, latest: revisionView(revision, user.name) } }
})
