import { CreateApiTokenBody } from '#shared/utils/token-schemas'

/** POST /api/me/tokens — `{ name, scope, expiresInDays? }`; 201 with the token and, this once, its secret. */
export default defineEventHandler(async (event) => {
  const user = await requireBrowserUser(event, 'manage API tokens')
  const body = await validateBody(event, CreateApiTokenBody)
  const created = await createApiToken(user.id, body)
  setResponseStatus(event, 201)
  return created
})
