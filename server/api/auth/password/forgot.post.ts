/** POST /api/auth/password/forgot — mail a reset link; the same answer for every address. */
import { PasswordForgotBody } from '#shared/utils/invitation-schemas'

export default defineEventHandler(async (event) => {
  const { email } = await validateBody(event, PasswordForgotBody)
  // Off the answer's path: a known address (look-up, token, mail) answers as fast as an unknown one.
  void requestPasswordReset(email).catch((error) => console.error('[password reset] could not process a request:', error))
  setResponseStatus(event, 202)
  return { message: RESET_REQUESTED_MESSAGE }
})
