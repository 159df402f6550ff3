/**
 * POST /api/auth/password/reset — choose a new password with the token from a
 * reset mail. The person then signs in with the new password.
 */
import { PasswordResetBody } from '#shared/utils/invitation-schemas'

export default defineEventHandler(async (event) => {
  const body = await validateBody(event, PasswordResetBody)
  await resetPassword(body.token, await hashPassword(body.password))
  return { changed: true }
})
