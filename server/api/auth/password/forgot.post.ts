/** POST /api/auth/password/forgot — mail a reset link; the same answer for every address. */
import { PasswordForgotBody } from '#shared/utils/invitation-schemas'

export default defineEventHandler(async (event) => {
  const { email } = await validateBody(event, PasswordForgotBody)
  await requestPasswordReset(event, email)
  setResponseStatus(event, 202)
  return { message: RESET_REQUESTED_MESSAGE }
})
