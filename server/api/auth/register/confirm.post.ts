/** POST /api/auth/register/confirm (`token`) — creates the account of a confirmed registration and signs it in. */
import { RegisterConfirmBody } from '#shared/utils/invitation-schemas'

export default defineEventHandler(async (event) => {
  const { token } = await validateBody(event, RegisterConfirmBody)
  const user = await confirmRegistration(token)
  await startSession(event, user)
  setResponseStatus(event, 201)
  return { user: { ...user, isAdmin: false } }
})
