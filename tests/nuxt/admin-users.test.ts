/**
 * Site administration routes: an administrator lists the accounts and grants
 * or revokes the administrator flag; everyone else gets 404; the site never
 * loses its last administrator; every change is in the audit log.
 * Files of this project run one at a time, so changing who is admin here
 * does not race another file; each test leaves the seeded admin as it was.
 */
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { TEST_DATABASE_URL } from '../setup/test-database'
import { api, makeLab, signInAs, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

let admin: SignedIn
let db: mysql.Connection
beforeAll(async () => {
  admin = await signInAs('admin')
  db = await mysql.createConnection(TEST_DATABASE_URL)
})
afterAll(async () => { await db.end() })

async function auditActions(userId: number): Promise<string[]> {
  const [rows] = await db.query('SELECT action FROM audit_log WHERE action LIKE ? AND JSON_VALUE(detail, \'$.userId\') = ? ORDER BY id', ['admin.%', userId])
  return (rows as { action: string }[]).map((r) => r.action)
}

describe('GET /api/admin/users', () => {
  it('shows an administrator every account with its labs and admin flag', async () => {
    const someone = await signUp('listed')
    const lab = await makeLab(someone)
    const answer = await api('/api/admin/users', { cookie: admin.cookie })
    expect(answer.status).toBe(200)
    const listed = answer.body.users.find((u: { email: string }) => u.email === someone.user.email)
    expect(listed).toMatchObject({ name: someone.user.name, isAdmin: false, labs: [{ slug: lab, role: 'owner' }] })
    expect(Number.isNaN(Date.parse(listed.createdAt))).toBe(false)
    expect(answer.body.users.find((u: { email: string }) => u.email === admin.user.email)?.isAdmin).toBe(true)
  })

  it('answers 404 to a lab owner who is not a site administrator, and 401 to nobody', async () => {
    const owner = await signInAs('owner')
    expect((await api('/api/admin/users', { cookie: owner.cookie })).status).toBe(404)
    expect((await api(`/api/admin/users/${owner.user.id}`, { method: 'PATCH', cookie: owner.cookie, body: { isAdmin: true } })).status).toBe(404)
    expect((await api('/api/admin/users')).status).toBe(401)
  })
})

describe('PATCH /api/admin/users/[user]', () => {
  it('makes an account administrator and back, and logs both', async () => {
    const someone = await signUp('promoted')
    const grant = await api(`/api/admin/users/${someone.user.id}`, { method: 'PATCH', cookie: admin.cookie, body: { isAdmin: true } })
    expect(grant.status).toBe(200)
    expect((await api('/api/admin/users', { cookie: someone.cookie })).status).toBe(200)
    const revoke = await api(`/api/admin/users/${someone.user.id}`, { method: 'PATCH', cookie: admin.cookie, body: { isAdmin: false } })
    expect(revoke.status).toBe(200)
    expect((await api('/api/admin/users', { cookie: someone.cookie })).status).toBe(404)
    expect(await auditActions(someone.user.id)).toEqual(['admin.grant', 'admin.revoke'])
  })

  it('never takes the flag from the last administrator', async () => {
    const deputy = await signUp('deputy')
    expect((await api(`/api/admin/users/${deputy.user.id}`, { method: 'PATCH', cookie: admin.cookie, body: { isAdmin: true } })).status).toBe(200)
    // Every other administrator steps down, so the deputy is the only one left.
    const listed = (await api('/api/admin/users', { cookie: deputy.cookie })).body.users as { id: number, isAdmin: boolean }[]
    const others = listed.filter((u) => u.isAdmin && u.id !== deputy.user.id).map((u) => u.id)
    for (const id of others) {
      expect((await api(`/api/admin/users/${id}`, { method: 'PATCH', cookie: deputy.cookie, body: { isAdmin: false } })).status).toBe(200)
    }
    const refused = await api(`/api/admin/users/${deputy.user.id}`, { method: 'PATCH', cookie: deputy.cookie, body: { isAdmin: false } })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/only site administrator/)
    expect((await api('/api/admin/users', { cookie: deputy.cookie })).status).toBe(200)
    // Put the others back, then the deputy may step down.
    for (const id of others) {
      expect((await api(`/api/admin/users/${id}`, { method: 'PATCH', cookie: deputy.cookie, body: { isAdmin: true } })).status).toBe(200)
    }
    expect((await api(`/api/admin/users/${deputy.user.id}`, { method: 'PATCH', cookie: deputy.cookie, body: { isAdmin: false } })).status).toBe(200)
  })

  it('says what to change for a bad body or id, and 404 for an unknown account', async () => {
    const bad = await api('/api/admin/users/1', { method: 'PATCH', cookie: admin.cookie, body: { isAdmin: 'yes' } })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/isAdmin must be true or false/)
    expect((await api('/api/admin/users/abc', { method: 'PATCH', cookie: admin.cookie, body: { isAdmin: true } })).status).toBe(400)
    expect((await api('/api/admin/users/99999999', { method: 'PATCH', cookie: admin.cookie, body: { isAdmin: true } })).status).toBe(404)
  })
})
