import { LabParams, SystemCreateBody, starterSource } from '#shared/utils/lab-schemas'

/** An editor creates a system; its source (or a starter text) becomes revision 1. */
export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'editor')
  const body = await validateBody(event, SystemCreateBody)
  const source = body.source?.trim() ? body.source : starterSource(body.title)
  const db = useDb()
  const revision = await db.transaction(async (tx) => {
    const [inserted] = await tx.insert(tables.systems).values({ labId: lab.id, slug: body.slug, title: body.title, createdBy: user.id }).$returningId()
    const first = await addRevision(tx, { systemId: inserted!.id, number: 1, parentId: null, source, authorId: user.id, message: 'Created' })
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'system.create', detail: { slug: body.slug } })
    return first
  }).catch((error) => {
    if (isDuplicateKey(error)) {
      throw createError({ statusCode: 409, message: `${lab.name} already has a system at "${body.slug}"; choose another address`, data: { issues: [{ path: 'slug', message: 'Already used in this lab; choose another' }] } })
    }
    throw error
  })
  setResponseStatus(event, 201)
  return { system: { slug: body.slug, title: body.title, isLibrary: false, latest: revisionView(revision, user.name) } }
})
