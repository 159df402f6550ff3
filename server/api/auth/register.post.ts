/**
 * POST /api/auth/register — 202 with the same answer for every address; the
 * account is created when the mailed confirmation link is opened
 * (POST /api/auth/register/confirm). See server/utils/registrations.ts.
 */
import { RegisterBody } from '#shared/utils/account-schemas'

export default defineEventHandler(async (event) => {
  const body = await validateBody(event, RegisterBody)
  // Off the answer's path, so a known address answers as fast as a new one.
  void requestRegistration(event, body).catch((error) => console.error('[register] could not process a registration:', error))
  setResponseStatus(event, 202)
  return { message: REGISTRATION_REQUESTED_MESSAGE }
})
