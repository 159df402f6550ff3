import { LabCreateBody } from '#shared/utils/lab-schemas'

/** Create a lab; its creator becomes its first owner. */
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const body = await validateBody(event, LabCreateBody)
  const db = useDb()
  await db.transaction(async (tx) => {
    const [inserted] = await tx.insert(tables.labs).values({ slug: body.slug, name: body.name, createdBy: user.id }).$returningId()
    await tx.insert(tables.labMembers).values({ labId: inserted!.id, userId: user.id, role: 'owner' })
    await recordAudit(tx, { actorId: user.id, labId: inserted!.id, action: 'lab.create', detail: { slug: body.slug } })
  }).catch((error) => {
    if (isDuplicateKey(error)) {
      throw createError({ statusCode: 409, message: `The address "${body.slug}" is taken by another lab; choose another`, data: { issues: [{ path: 'slug', message: 'Taken by another lab; choose another' }] } })
    }
    throw error
  })
  setResponseStatus(event, 201)
  return { lab: { slug: body.slug, name: body.name, role: 'owner' as const } }
})
