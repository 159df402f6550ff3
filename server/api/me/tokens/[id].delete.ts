import { ApiTokenParams } from '#shared/utils/token-schemas'

/** DELETE /api/me/tokens/[id] — revokes the token at once; `{ revoked: id }`. */
export default defineEventHandler(async (event) => {
  const user = await requireBrowserUser(event, 'manage API tokens')
  const { id } = validateParams(event, ApiTokenParams)
  await revokeApiToken(user.id, id)
  return { revoked: id }
})
