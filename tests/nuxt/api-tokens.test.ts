/**
 * Personal API tokens: made, listed and revoked on the account's cookie;
 * `Authorization: Bearer` on read and write routes for each scope, with the
 * cookie's role rules; revoked and expired tokens; what a token may never do.
 */
import { describe, expect, it } from 'vitest'
import mysql from 'mysql2/promise'
import { useBuiltServer } from '../setup/server'
import { api, freshClientAddress, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { TEST_DATABASE_URL } from '../setup/test-database'

await useBuiltServer()

async function makeToken(who: SignedIn, scope: 'read' | 'write', extra: Record<string, unknown> = {}) {
  const answer = await api('/api/me/tokens', { method: 'POST', cookie: who.cookie, body: { name: `${scope} token`, scope, ...extra } })
  expect(answer.status).toBe(201)
  return answer.body as { id: number, token: string, name: string, scope: string, expiresAt: string | null }
}

/** A request with the token and no cookie, from an address of its own (so failures of one test do not throttle another). */
function withToken(token: string, path: string, options: { method?: string, body?: unknown, address?: string } = {}) {
  return api(path, { ...options, headers: { authorization: `Bearer ${token}`, 'x-forwarded-for': options.address ?? freshClientAddress() } })
}

describe('making, listing and revoking tokens', () => {
  it('returns the secret once, lists without it, and revokes', async () => {
    const me = await signUp('tokens')
    const created = await makeToken(me, 'read', { expiresInDays: 30 })
    expect(created.token).toMatch(/^eqp_[A-Za-z0-9_-]{43}$/)
    expect(created).toMatchObject({ name: 'read token', scope: 'read', lastUsedAt: null })
    const days = (Date.parse(created.expiresAt!) - Date.now()) / 86_400_000
    expect(days).toBeGreaterThan(29.9)
    expect(days).toBeLessThan(30.1)

    const list = await api('/api/me/tokens', { cookie: me.cookie })
    expect(list.status).toBe(200)
    expect(list.body.tokens).toEqual([{ id: created.id, name: 'read token', scope: 'read', createdAt: expect.any(String), lastUsedAt: null, expiresAt: created.expiresAt }])
    expect(JSON.stringify(list.body)).not.toContain(created.token)

    expect((await withToken(created.token, '/api/me')).status).toBe(200)
    const used = (await api('/api/me/tokens', { cookie: me.cookie })).body.tokens[0]
    expect(Date.parse(used.lastUsedAt)).toBeGreaterThan(Date.now() - 60_000)

    const revoked = await api(`/api/me/tokens/${created.id}`, { method: 'DELETE', cookie: me.cookie })
    expect(revoked.status).toBe(200)
    expect((await api('/api/me/tokens', { cookie: me.cookie })).body.tokens).toEqual([])
    const refused = await withToken(created.token, '/api/me')
    expect(refused.status).toBe(401)
    expect(refused.body.message).toMatch(/revoked/)
    expect((await api(`/api/me/tokens/${created.id}`, { method: 'DELETE', cookie: me.cookie })).status).toBe(404)

    const connection = await mysql.createConnection(TEST_DATABASE_URL)
    try {
      const [rows] = await connection.query("SELECT action, detail FROM audit_log WHERE actor_id = ? AND action LIKE 'token.%' ORDER BY id", [me.user.id]) as [{ action: string, detail: string }[], unknown]
      expect(rows.map((r) => r.action)).toEqual(['token.create', 'token.revoke'])
      expect(rows.map((r) => JSON.parse(r.detail).tokenId)).toEqual([created.id, created.id])
      expect(JSON.stringify(rows)).not.toContain(created.token)
    } finally {
      await connection.end()
    }
  })

  it('refuses bad input with a message per field, and another account cannot revoke my token', async () => {
    const me = await signUp('tokens-bad')
    const bad = await api('/api/me/tokens', { method: 'POST', cookie: me.cookie, body: { name: ' ', scope: 'admin', expiresInDays: 0 } })
    expect(bad.status).toBe(400)
    expect(bad.body.data.issues.map((i: { path: string }) => i.path).sort()).toEqual(['expiresInDays', 'name', 'scope'])
    const mine = await makeToken(me, 'write')
    const other = await signUp('tokens-other')
    expect((await api(`/api/me/tokens/${mine.id}`, { method: 'DELETE', cookie: other.cookie })).status).toBe(404)
    expect((await withToken(mine.token, '/api/me')).status).toBe(200)
    expect((await api('/api/me/tokens', { cookie: undefined })).status).toBe(401)
  })
})

describe('Bearer authentication', () => {
  it('reads and writes with the role rules of the cookie, narrowed by the scope', async () => {
    const owner = await signUp('tok-owner')
    const viewer = await signUp('tok-viewer')
    const lab = await makeLab(owner, [{ who: viewer, role: 'viewer' }])
    const ownerRead = await makeToken(owner, 'read')
    const ownerWrite = await makeToken(owner, 'write')
    const viewerWrite = await makeToken(viewer, 'write')

    // Read route: both scopes.
    for (const t of [ownerRead, ownerWrite, viewerWrite]) {
      const systems = await withToken(t.token, `/api/labs/${lab}/systems`)
      expect(systems.status).toBe(200)
    }
    // Write route: a read token is refused whatever the role; a write token gets the role's rules.
    const body = { title: 'Bearer made', slug: 'bearer-made' }
    const readWrite = await withToken(ownerRead.token, `/api/labs/${lab}/systems`, { method: 'POST', body })
    expect(readWrite.status).toBe(403)
    expect(readWrite.body.message).toMatch(/only read/)
    const viewerWrites = await withToken(viewerWrite.token, `/api/labs/${lab}/systems`, { method: 'POST', body })
    expect(viewerWrites.status).toBe(403)
    expect(viewerWrites.body.message).toMatch(/editor role/)
    const made = await withToken(ownerWrite.token, `/api/labs/${lab}/systems`, { method: 'POST', body })
    expect(made.status).toBe(201)
    expect((await api(`/api/labs/${lab}/systems/bearer-made`, { cookie: owner.cookie })).status).toBe(200)
  })

  it('lets a token write from any origin without a cookie, but not a cookie from another origin', async () => {
    const owner = await signUp('tok-origin')
    const lab = await makeLab(owner)
    const token = await makeToken(owner, 'write')
    const foreign = { authorization: `Bearer ${token.token}`, origin: 'https://elsewhere.example' }
    const tokenOnly = await api(`/api/labs/${lab}/systems`, { method: 'POST', body: { title: 'From a notebook', slug: 'notebook' }, headers: foreign })
    expect(tokenOnly.status).toBe(201)
    const withCookie = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Forged', slug: 'forged' }, headers: foreign })
    expect(withCookie.status).toBe(403)
    expect(withCookie.body.message).toMatch(/elsewhere\.example/)
  })

  it('gets the signed-in body limit, not the anonymous one', async () => {
    const me = await signUp('tok-body')
    const token = await makeToken(me, 'read')
    // 40 KB of comments: over the 16 KiB allowed without a session, far under the signed-in limit.
    const source = `system "Long"\n${'# a comment line that makes the text long enough\n'.repeat(800)}`
    const checked = await api('/api/check', { method: 'POST', body: { source }, headers: { authorization: `Bearer ${(await makeToken(me, 'write')).token}` } })
    expect(checked.status).toBe(200)
    const readOnly = await api('/api/check', { method: 'POST', body: { source }, headers: { authorization: `Bearer ${token.token}` } })
    expect(readOnly.status).toBe(403)
  })

  it('answers 404 for a lab the token\'s account is not a member of', async () => {
    const owner = await signUp('tok-lab')
    const lab = await makeLab(owner)
    const stranger = await signUp('tok-stranger')
    const token = await makeToken(stranger, 'write')
    expect((await withToken(token.token, `/api/labs/${lab}`)).status).toBe(404)
    expect((await withToken(token.token, `/api/labs/${lab}/systems`, { method: 'POST', body: { title: 'X', slug: 'xx' } })).status).toBe(404)
  })

  it('refuses expired, unknown and malformed tokens with 401, and throttles an address that keeps trying', async () => {
    const me = await signUp('tok-expired')
    const token = await makeToken(me, 'write', { expiresInDays: 1 })
    const connection = await mysql.createConnection(TEST_DATABASE_URL)
    try {
      await connection.query('UPDATE api_tokens SET expires_at = NOW(3) - INTERVAL 1 MINUTE WHERE id = ?', [token.id])
    } finally {
      await connection.end()
    }
    const expired = await withToken(token.token, '/api/labs')
    expect(expired.status).toBe(401)
    expect(expired.body.message).toMatch(/expired on/)
    expect((await api('/api/me/tokens', { cookie: me.cookie })).body.tokens).toEqual([])

    const unknown = await withToken(`eqp_${'A'.repeat(43)}`, '/api/labs')
    expect(unknown.status).toBe(401)
    expect(unknown.body.message).toMatch(/not known/)
    const malformed = await withToken('not-a-token', '/api/labs')
    expect(malformed.status).toBe(401)
    expect(JSON.stringify(malformed.body)).not.toContain('not-a-token')

    const address = freshClientAddress()
    const statuses: number[] = []
    for (let i = 0; i < 12; i++) statuses.push((await withToken(`eqp_${'B'.repeat(43)}`, '/api/labs', { address })).status)
    expect(statuses).toEqual([...Array(11).fill(401), 429])
    const throttled = await withToken(`eqp_${'B'.repeat(43)}`, '/api/labs', { address })
    expect(throttled.status).toBe(429)
    expect(Number(throttled.headers.get('retry-after'))).toBeGreaterThan(0)
    // A good token from another address is not affected.
    const good = await makeToken(me, 'read')
    expect((await withToken(good.token, '/api/labs')).status).toBe(200)
  })

  it('cannot manage tokens, sessions or the password, nor administer the site', async () => {
    const me = await signUp('tok-limits')
    const token = (await makeToken(me, 'write')).token
    const refusals = [
      await withToken(token, '/api/me/tokens', { method: 'POST', body: { name: 'more', scope: 'write' } }),
      await withToken(token, '/api/me/tokens'),
      await withToken(token, '/api/me/tokens/1', { method: 'DELETE' }),
      await withToken(token, '/api/me/sessions'),
      await withToken(token, '/api/me/sessions', { method: 'DELETE' }),
      await withToken(token, '/api/auth/password', { method: 'POST', body: { currentPassword: me.password, newPassword: 'another long password' } }),
      await withToken(token, '/api/admin/users'),
    ]
    for (const answer of refusals) {
      expect(answer.status).toBe(403)
      expect(answer.body.message).toMatch(/An API token cannot/)
    }
    expect((await api('/api/me/tokens', { cookie: me.cookie })).body.tokens).toHaveLength(1)
  })
})
