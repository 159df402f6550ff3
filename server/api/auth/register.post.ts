import { eq } from 'drizzle-orm'
import { RegisterBody } from '#shared/utils/account-schemas'

export default defineEventHandler(async (event) => {
  const body = await validateBody(event, RegisterBody)
  const db = useDb()
  const [existing] = await db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, body.email))
  if (existing) throw createError({ statusCode: 409, message: 'An account with this e-mail address exists; sign in instead' })
  let id: number
  try {
    const [inserted] = await db.insert(tables.users).values({
      email: body.email,
      name: body.name,
      passwordHash: await hashPassword(body.password),
    }).$returningId()
    id = inserted!.id
  } catch (error) {
    if (isDuplicateKey(error)) throw createError({ statusCode: 409, message: 'An account with this e-mail address exists; sign in instead' })
    throw error
  }
  await recordAudit({ actorId: id, labId: null, action: 'user.register' })
  const user = { id, email: body.email, name: body.name }
  await setUserSession(event, { user, loggedInAt: Date.now() })
  setResponseStatus(event, 201)
  return { user: { ...user, isAdmin: false } }
})
