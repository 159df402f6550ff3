/**
 * POST /api/auth/register — 202 with the same answer for every address; the
 * account is created when the mailed confirmation link is opened
 * (POST /api/auth/register/confirm). See server/utils/registrations.ts.
 */
import { RegisterBody } from '#shared/utils/account-schemas'

export default defineEventHandler(async (event) => {
  const body = await validateBody(event, RegisterBody)
  // Per client address, whatever the e-mail: the form cannot be used to mail many strangers.
  const key = `register:address:${clientAddress(event)}`.slice(0, 320)
  if (await bumpCounter(key, 60, 'window') > REGISTRATIONS_PER_ADDRESS_PER_HOUR) {
    const [counter] = await readCounters([key])
    refuseForNow(event, `Too many registrations from your network in the last hour (at most ${REGISTRATIONS_PER_ADDRESS_PER_HOUR}).`, (counter!.firstAt.getTime() + 3600_000 - Date.now()) / 1000)
  }
  // Off the answer's path, so a known address answers as fast as a new one.
  void requestRegistration(body).catch((error) => console.error('[register] could not process a registration:', error))
  setResponseStatus(event, 202)
  return { message: REGISTRATION_REQUESTED_MESSAGE }
})
