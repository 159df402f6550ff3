/**
 * Personal API tokens: `Authorization: Bearer eqp_…` stands for the account
 * that made the token, with exactly its lab roles, narrowed by the token's
 * scope (a `read` token may only GET). Only the secret's sha256 is stored;
 * the secret is returned once, by `createApiToken`. A token is never read
 * from a URL, and neither it nor its hash is logged or audited (the audit
 * names the token's id and name).
 *
 * Requests with a token that is unknown, revoked or expired count against
 * the client address (API_TOKEN_THROTTLE in limits.ts), like failed sign-ins.
 */
import type { H3Event } from 'h3'
import { and, desc, eq, gt, isNull, or, sql } from 'drizzle-orm'
import type { ApiTokenScope, ApiTokenSummary, CreateApiTokenInput, CreatedApiToken } from '../../shared/utils/token-schemas'
import { API_TOKEN_PREFIX } from '../../shared/utils/token-schemas'
import type { ApiToken } from '../database/schema'
import { tables, useDb } from './db'
import { hashToken } from './tokens'
import { API_TOKEN_THROTTLE, API_TOKENS_PER_USER, failureWaitSeconds, refuseForNow } from './limits'
import { bumpCounter, readCounters } from './throttle-counters'
import { clientAddress } from './client-address'
import { LAST_SEEN_RESOLUTION_MS } from './sessions'
import { recordAudit } from './audit'
import { randomBytes } from 'node:crypto'

/** What a request authenticated by a token carries in `event.context.apiToken`. */
export interface TokenAuth {
  id: number
  scope: ApiTokenScope
}

/** The token of `Authorization: Bearer …`, undefined when the header is absent or another scheme. */
export function bearerToken(event: H3Event): string | undefined {
  const header = getRequestHeader(event, 'authorization')
  if (!header) return undefined
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header)
  return match ? match[1] : undefined
}

export function hasBearer(event: H3Event): boolean {
  return /^Bearer\s/i.test(getRequestHeader(event, 'authorization') ?? '')
}

/**
 * A request authenticated by an API token alone, with no session cookie: no
 * browser attaches such a header by itself, so it cannot be a cross-site
 * request forgery (the same-origin check lets it through).
 */
export function isBearerOnly(event: H3Event): boolean {
  if (!hasBearer(event)) return false
  const cookieName = (useRuntimeConfig(event).session as { name?: string } | undefined)?.name || 'nuxt-session'
  return !getCookie(event, cookieName)
}

function summary(row: ApiToken): ApiTokenSummary {
  return {
    id: row.id,
    name: row.name,
    scope: row.scope,
    createdAt: row.createdAt.toISOString(),
    lastUsedAt: row.lastUsedAt?.toISOString() ?? null,
    expiresAt: row.expiresAt?.toISOString() ?? null,
  }
}

function live(now: Date) {
  return and(isNull(tables.apiTokens.revokedAt), or(isNull(tables.apiTokens.expiresAt), gt(tables.apiTokens.expiresAt, now)))
}

/** The account's live tokens, newest first. */
export async function listApiTokens(userId: number): Promise<ApiTokenSummary[]> {
  const rows = await useDb().select().from(tables.apiTokens)
    .where(and(eq(tables.apiTokens.userId, userId), live(new Date())))
    .orderBy(desc(tables.apiTokens.createdAt), desc(tables.apiTokens.id))
  return rows.map(summary)
}

/** Makes a token; the answer holds the secret, which is not kept anywhere. 409 past API_TOKENS_PER_USER live tokens. */
export async function createApiToken(userId: number, input: CreateApiTokenInput): Promise<CreatedApiToken> {
  const db = useDb()
  const token = API_TOKEN_PREFIX + randomBytes(32).toString('base64url')
  const expiresAt = input.expiresInDays ? new Date(Date.now() + input.expiresInDays * 86_400_000) : null
  const id = await db.transaction(async (tx) => {
    // Lock the account's row so two requests at once cannot both pass the count.
    await tx.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, userId)).for('update')
    const [count] = await tx.select({ n: sql<number>`count(*)` }).from(tables.apiTokens)
      .where(and(eq(tables.apiTokens.userId, userId), live(new Date())))
    if (Number(count?.n ?? 0) >= API_TOKENS_PER_USER) {
      throw createError({ statusCode: 409, message: `You already have ${API_TOKENS_PER_USER} API tokens; revoke one you no longer use first` })
    }
    const [inserted] = await tx.insert(tables.apiTokens).values({
      userId, name: input.name, scope: input.scope, tokenHash: hashToken(token), expiresAt,
    }).$returningId()
    await recordAudit(tx, {
      actorId: userId, labId: null, action: 'token.create',
      detail: { tokenId: inserted!.id, name: input.name, scope: input.scope, expiresAt: expiresAt?.toISOString() ?? null },
    })
    return inserted!.id
  })
  const [row] = await db.select().from(tables.apiTokens).where(eq(tables.apiTokens.id, id))
  return { ...summary(row!), token }
}

/** Revokes one of the account's live tokens; 404 when it has none with that id. */
export async function revokeApiToken(userId: number, id: number): Promise<void> {
  const db = useDb()
  const [row] = await db.select().from(tables.apiTokens)
    .where(and(eq(tables.apiTokens.id, id), eq(tables.apiTokens.userId, userId), isNull(tables.apiTokens.revokedAt)))
  if (!row) throw createError({ statusCode: 404, message: `You have no API token ${id}; reload the list of tokens` })
  await db.transaction(async (tx) => {
    await tx.update(tables.apiTokens).set({ revokedAt: sql`CURRENT_TIMESTAMP(3)` }).where(eq(tables.apiTokens.id, id))
    await recordAudit(tx, { actorId: userId, labId: null, action: 'token.revoke', detail: { tokenId: id, name: row.name } })
  })
}

const throttleKey = (address: string) => `api-token:address:${address}`.slice(0, 320)

async function refuseToken(event: H3Event, address: string, message: string): Promise<never> {
  await bumpCounter(throttleKey(address), API_TOKEN_THROTTLE.forgetAfterMinutes, 'idle')
  throw createError({ statusCode: 401, message })
}

const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' })

/**
 * The account and token of `Authorization: Bearer`: 401 for a malformed,
 * unknown, revoked or expired token (each counted against the client
 * address), 429 while that address is throttled. Refreshes `lastUsedAt` at
 * most once a minute.
 */
export async function authenticateBearer(event: H3Event): Promise<{ userId: number, token: TokenAuth }> {
  const address = clientAddress(event)
  const [counter] = await readCounters([throttleKey(address)])
  const wait = failureWaitSeconds(API_TOKEN_THROTTLE, counter, Date.now())
  if (wait > 0) refuseForNow(event, 'Too many requests with a wrong, revoked or expired API token from your address.', wait)
  const secret = bearerToken(event)
  if (!secret || !secret.startsWith(API_TOKEN_PREFIX)) {
    return refuseToken(event, address, `The Authorization header must be "Bearer ${API_TOKEN_PREFIX}…" with an API token made on the settings page`)
  }
  const db = useDb()
  const [row] = await db.select().from(tables.apiTokens).where(eq(tables.apiTokens.tokenHash, hashToken(secret)))
  if (!row) return refuseToken(event, address, 'This API token is not known; make a new one on the settings page')
  if (row.revokedAt) return refuseToken(event, address, `The API token "${row.name}" was revoked; make a new one on the settings page`)
  const now = Date.now()
  if (row.expiresAt && row.expiresAt.getTime() <= now) {
    return refuseToken(event, address, `The API token "${row.name}" expired on ${dateFormat.format(row.expiresAt)} UTC; make a new one on the settings page`)
  }
  if (!row.lastUsedAt || now - row.lastUsedAt.getTime() >= LAST_SEEN_RESOLUTION_MS) {
    await db.update(tables.apiTokens).set({ lastUsedAt: sql`CURRENT_TIMESTAMP(3)` }).where(eq(tables.apiTokens.id, row.id))
  }
  return { userId: row.userId, token: { id: row.id, scope: row.scope } }
}
