import type { ApiTokenListAnswer } from '#shared/types/account'

/** GET /api/me/tokens — the account's live API tokens (never their secrets). */
export default defineEventHandler(async (event): Promise<ApiTokenListAnswer> => {
  const user = await requireBrowserUser(event, 'manage API tokens')
  return { tokens: await listApiTokens(user.id) }
})
