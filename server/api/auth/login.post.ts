import { eq } from 'drizzle-orm'
import { LoginBody } from '#shared/utils/account-schemas'

// One message for an unknown e-mail and a wrong password, so sign-in does
// not tell a stranger which addresses have accounts.
const INVALID_CREDENTIALS = 'E-mail or password is incorrect'

// Compared against when the e-mail is unknown, so both failures take as long.
let decoyHash: Promise<string> | undefined

export default defineEventHandler(async (event) => {
  const body = await validateBody(event, LoginBody)
  const ip = getRequestIP(event) ?? 'unknown'
  const wait = loginRetryAfterSeconds(body.email, ip)
  if (wait > 0) {
    setResponseHeader(event, 'Retry-After', wait)
    throw createError({
      statusCode: 429,
      message: `Too many failed sign-ins. Try again in ${Math.ceil(wait / 60)} minute${wait > 60 ? 's' : ''}.`,
      data: { retryAfterSeconds: wait },
    })
  }
  const [user] = await useDb().select().from(tables.users).where(eq(tables.users.email, body.email))
  decoyHash ??= hashPassword('not a password of anyone')
  const valid = await verifyPassword(user?.passwordHash ?? await decoyHash, body.password)
  if (!user || !valid) {
    recordLoginFailure(body.email, ip)
    throw createError({ statusCode: 401, message: INVALID_CREDENTIALS })
  }
  clearLoginFailures(body.email)
  const sessionUser = { id: user.id, email: user.email, name: user.name }
  await setUserSession(event, { user: sessionUser, loggedInAt: Date.now() })
  return { user: { ...sessionUser, isAdmin: user.isAdmin } }
})
