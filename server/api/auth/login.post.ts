import { eq } from 'drizzle-orm'
import { LoginBody } from '#shared/utils/account-schemas'

// One message for an unknown e-mail and a wrong password, so sign-in does
// not tell a stranger which addresses have accounts.
const INVALID_CREDENTIALS = 'E-mail or password is incorrect'

// Compared against when the e-mail is unknown, so both failures take as long.
let decoyHash: Promise<string> | undefined

export default defineEventHandler(async (event) => {
  const body = await validateBody(event, LoginBody)
  const address = clientAddress(event)
  const wait = await loginRetryAfterSeconds(body.email, address)
  if (wait > 0) refuseForNow(event, 'Too many failed sign-ins for this account from your network.', wait)
  const [user] = await useDb().select().from(tables.users).where(eq(tables.users.email, body.email))
  decoyHash ??= hashPassword('not a password of anyone')
  const valid = await verifyPassword(user?.passwordHash ?? await decoyHash, body.password)
  if (!user || !valid) {
    await recordLoginFailure(body.email, address)
    throw createError({ statusCode: 401, message: INVALID_CREDENTIALS })
  }
  await clearLoginFailures(body.email, address)
  const sessionUser = { id: user.id, email: user.email, name: user.name }
  await startSession(event, sessionUser)
  return { user: { ...sessionUser, isAdmin: user.isAdmin } }
})
