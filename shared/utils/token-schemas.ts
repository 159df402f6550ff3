/**
 * Personal API tokens: what `POST /api/me/tokens` takes, shared by the route
 * and the settings page. A `read` token may only read (GET); a `write` token
 * may do whatever the account may do in its labs, except manage tokens,
 * sessions, the password or the site (those need the browser's sign-in).
 */
import { z } from 'zod'

export const API_TOKEN_SCOPES = ['read', 'write'] as const
export type ApiTokenScope = (typeof API_TOKEN_SCOPES)[number]

/** The longest expiry a token may be given, in days (a token may also never expire). */
export const API_TOKEN_MAX_DAYS = 365

/** Every secret starts with this, so it is recognisable in a leaked file or a secret scanner. */
export const API_TOKEN_PREFIX = 'eqp_'

export const CreateApiTokenBody = z.object({
  name: z.string().trim()
    .min(1, { error: 'Give the token a name, e.g. the machine or script that will use it' })
    .max(80, { error: 'Use at most 80 characters' }),
  scope: z.enum(API_TOKEN_SCOPES, { error: 'scope must be "read" or "write"' }),
  expiresInDays: z.int({ error: `expiresInDays must be a whole number of days from 1 to ${API_TOKEN_MAX_DAYS}` })
    .min(1, { error: 'expiresInDays must be at least 1' })
    .max(API_TOKEN_MAX_DAYS, { error: `expiresInDays must be at most ${API_TOKEN_MAX_DAYS}` })
    .optional(),
})
export const ApiTokenParams = z.object({
  id: z.coerce.number({ error: 'The token id must be a number' }).int({ error: 'The token id must be a whole number' }).positive({ error: 'The token id must be positive' }),
})

export type CreateApiTokenInput = z.infer<typeof CreateApiTokenBody>

/** One token as listed (never its secret): the answer's shape, also used by the API description. */
export const ApiTokenSummarySchema = z.object({
  id: z.int(),
  name: z.string(),
  scope: z.enum(API_TOKEN_SCOPES),
  createdAt: z.iso.datetime(),
  lastUsedAt: z.iso.datetime().nullable(),
  expiresAt: z.iso.datetime().nullable(),
})
export type ApiTokenSummary = z.infer<typeof ApiTokenSummarySchema>

/** The answer of `POST /api/me/tokens`: the summary and, this once, the secret. */
export const CreatedApiTokenSchema = ApiTokenSummarySchema.extend({
  token: z.string().startsWith(API_TOKEN_PREFIX).meta({ description: 'The secret, returned only in this answer; send it as Authorization: Bearer' }),
})
export type CreatedApiToken = z.infer<typeof CreatedApiTokenSchema>
