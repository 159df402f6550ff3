// Sessions that end and sign-in throttling that cannot lock an owner out,
// against the built server and the real MariaDB. Client addresses are stood
// for with X-Forwarded-For, which the test server believes from its loopback
// proxy (NUXT_TRUSTED_PROXIES in global-server.ts).
import { resolve } from 'node:path'
import { describe, expect, inject, it } from 'vitest'
import mysql from 'mysql2/promise'
import { useBuiltServer } from '../setup/server'
import { api, freshEmail, signIn, signUp, type SignedIn } from '../setup/accounts'
import { linkTo, waitForMail } from '../setup/mail'
import { TEST_DATABASE_URL } from '../setup/test-database'
import { startServerProcess } from '../setup/server-process'
import { LOGIN_THROTTLE } from '../../server/utils/limits'
import { DEFAULT_SESSION_LIFETIMES } from '../../server/utils/session-lifetime'

await useBuiltServer()

async function query<T = Record<string, unknown>>(sql: string, values: unknown[] = []): Promise<T[]> {
  const connection = await mysql.createConnection(TEST_DATABASE_URL)
  try {
    const [rows] = await connection.query(sql, values)
    return rows as T[]
  } finally {
    await connection.end()
  }
}

const me = (who: { cookie: string }) => api('/api/me', { cookie: who.cookie })

function login(email: string, password: string, from: string) {
  return api('/api/auth/login', { method: 'POST', body: { email, password }, headers: { 'x-forwarded-for': from } })
}

describe('sessions end', () => {
  it('gives the session cookie a lifetime', async () => {
    const account = await signUp('lifetime')
    const answer = await api('/api/auth/login', { method: 'POST', body: { email: account.user.email, password: account.password } })
    const cookie = answer.headers.getSetCookie().find((c) => c.startsWith('nuxt-session='))!
    const expires = Date.parse(/Expires=([^;]+)/i.exec(cookie)![1]!)
    expect(Math.abs(expires - (Date.now() + DEFAULT_SESSION_LIFETIMES.absoluteMinutes * 60_000))).toBeLessThan(60_000)
  })

  it('refuses a copy of the cookie after signing out', async () => {
    const account = await signUp('copied')
    expect((await me(account)).status).toBe(200)
    expect((await api('/api/auth/logout', { method: 'POST', cookie: account.cookie })).status).toBe(200)
    const again = await me(account)
    expect(again.status).toBe(401)
    expect(again.body.message).toMatch(/session has ended.*sign in again/)
    // nuxt-auth-utils' own session route refuses it too.
    expect((await api('/api/_auth/session', { cookie: account.cookie })).status).toBe(401)
    expect((await api(`/api/labs`, { cookie: account.cookie })).status).toBe(401)
  })

  it('ends every other session on a password change; the changer stays signed in', async () => {
    const here = await signUp('changer')
    const elsewhere = await signIn(here.user.email, here.password)
    const changed = await api('/api/auth/password', { method: 'POST', cookie: here.cookie, body: { currentPassword: here.password, newPassword: 'a different passphrase' } })
    expect(changed.status).toBe(200)
    expect(changed.body.otherSessionsEnded).toBe(1)
    expect((await me(here)).status).toBe(200)
    expect((await me(elsewhere)).status).toBe(401)
  })

  it('ends every session of the account on a password reset', async () => {
    const one = await signUp('reset')
    const two = await signIn(one.user.email, one.password)
    await api('/api/auth/password/forgot', { method: 'POST', body: { email: one.user.email } })
    const token = new URL(linkTo(await waitForMail(one.user.email, /new password/), '/password/reset'), 'http://x').searchParams.get('token')
    expect((await api('/api/auth/password/reset', { method: 'POST', body: { token, password: 'a reset passphrase' } })).status).toBe(200)
    expect((await me(one)).status).toBe(401)
    expect((await me(two)).status).toBe(401)
    await expect(signIn(one.user.email, 'a reset passphrase')).resolves.toMatchObject({ user: { id: one.user.id } })
  })

  it('lists the other sessions and signs them all out, keeping this one', async () => {
    const here = await signUp('everywhere')
    const others: SignedIn[] = [await signIn(here.user.email, here.password), await signIn(here.user.email, here.password)]
    const listed = await api('/api/me/sessions', { cookie: here.cookie })
    expect(listed.status).toBe(200)
    expect(listed.body.others).toHaveLength(2)
    const out = await api('/api/me/sessions', { method: 'DELETE', cookie: here.cookie })
    expect(out.body).toEqual({ ended: 2 })
    for (const other of others) expect((await me(other)).status).toBe(401)
    expect((await me(here)).status).toBe(200)
    expect((await api('/api/me/sessions', { cookie: here.cookie })).body.others).toEqual([])
    expect((await api('/api/me/sessions', { method: 'DELETE' })).status).toBe(401)
  })

  it('ends a session left idle too long, and any session past its absolute lifetime', async () => {
    const idle = await signUp('idle')
    await query(`UPDATE sessions SET last_seen_at = NOW(3) - INTERVAL ${DEFAULT_SESSION_LIFETIMES.idleMinutes + 1} MINUTE WHERE user_id = ?`, [idle.user.id])
    const idleAnswer = await me(idle)
    expect(idleAnswer.status).toBe(401)
    expect(idleAnswer.body.message).toBe('You were signed out after 7 days without activity; sign in again')

    const old = await signUp('old')
    await query(`UPDATE sessions SET created_at = NOW(3) - INTERVAL ${DEFAULT_SESSION_LIFETIMES.absoluteMinutes + 1} MINUTE WHERE user_id = ?`, [old.user.id])
    const oldAnswer = await me(old)
    expect(oldAnswer.status).toBe(401)
    expect(oldAnswer.body.message).toBe('A sign-in lasts 30 days; sign in again')
    // An ended session's row is gone, so it cannot come back.
    expect(await query('SELECT id FROM sessions WHERE user_id IN (?, ?)', [idle.user.id, old.user.id])).toEqual([])
  })

  it('clears the sessions that ended unseen when the account signs in again', async () => {
    const forgetful = await signUp('unseen')
    await query(`UPDATE sessions SET last_seen_at = NOW(3) - INTERVAL ${DEFAULT_SESSION_LIFETIMES.idleMinutes + 1} MINUTE WHERE user_id = ?`, [forgetful.user.id])
    await signIn(forgetful.user.email, forgetful.password)
    const rows = await query<{ age: number }>('SELECT TIMESTAMPDIFF(MINUTE, last_seen_at, NOW(3)) AS age FROM sessions WHERE user_id = ?', [forgetful.user.id])
    expect(rows.map((r) => Number(r.age))).toEqual([0])
  })

  it('keeps an active session going and notes when it was last used', async () => {
    const active = await signUp('active')
    await query('UPDATE sessions SET last_seen_at = NOW(3) - INTERVAL 1 DAY WHERE user_id = ?', [active.user.id])
    expect((await me(active)).status).toBe(200)
    const [row] = await query<{ age: number }>('SELECT TIMESTAMPDIFF(SECOND, last_seen_at, NOW(3)) AS age FROM sessions WHERE user_id = ?', [active.user.id])
    expect(Number(row!.age)).toBeLessThan(60)
  })
})

describe('sign-in throttling', () => {
  const rule = LOGIN_THROTTLE.accountAndAddress

  it('slows a guesser down with growing waits, yet lets the owner in from another address', async () => {
    const owner = await signUp('target')
    const attacker = '203.0.113.5'
    for (let i = 0; i <= rule.freeFailures; i++) {
      expect((await login(owner.user.email, `guess ${i}`, attacker)).status).toBe(401)
    }
    // Past the free failures: even the right password waits, from that address.
    const blocked = await login(owner.user.email, owner.password, attacker)
    expect(blocked.status).toBe(429)
    const wait = Number(blocked.headers.get('retry-after'))
    expect(wait).toBeGreaterThan(rule.firstDelaySeconds - 5)
    expect(wait).toBeLessThanOrEqual(rule.firstDelaySeconds)
    expect(blocked.body.message).toMatch(/^Too many failed sign-ins .* Try again in \d+ seconds \(after \d\d:\d\d UTC\)\.$/)
    expect(blocked.body.data.retryAfterSeconds).toBe(wait)

    // The owner, elsewhere, signs in at once.
    const fromHome = await login(owner.user.email, owner.password, '198.51.100.7')
    expect(fromHome.status).toBe(200)

    // The counters are in MariaDB (so a restart or a second server process keeps them).
    const counters = await query<{ key: string, hits: number }>("SELECT `key`, hits FROM throttle_counters WHERE `key` = ?", [`login:address:${attacker}`])
    expect(counters[0]!.hits).toBeGreaterThanOrEqual(rule.freeFailures + 1)

    // Once the wait is over, the next miss doubles it.
    await query('UPDATE throttle_counters SET last_at = NOW(3) - INTERVAL ? SECOND WHERE `key` LIKE ? AND hits = ?', [rule.firstDelaySeconds + 1, 'login:account-address:%', rule.freeFailures + 1])
    expect((await login(owner.user.email, 'one more guess', attacker)).status).toBe(401)
    const longer = await login(owner.user.email, owner.password, attacker)
    expect(longer.status).toBe(429)
    expect(Number(longer.headers.get('retry-after'))).toBeGreaterThan(rule.firstDelaySeconds * 2 - 5)
  })

  it('holds in another server process on the same database (a restart, or a second instance)', async () => {
    const owner = await signUp('instances')
    const attacker = '203.0.113.99'
    for (let i = 0; i <= rule.freeFailures; i++) expect((await login(owner.user.email, `guess ${i}`, attacker)).status).toBe(401)
    const other = await startServerProcess(inject('serverEnv'), resolve(import.meta.dirname, '../..'))
    try {
      const loginThere = (from: string) => fetch(new URL('/api/auth/login', other.baseURL), {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-forwarded-for': from },
        body: JSON.stringify({ email: owner.user.email, password: owner.password }),
      })
      expect((await loginThere(attacker)).status).toBe(429)
      expect((await loginThere('198.51.100.8')).status).toBe(200)
    } finally {
      await other.stop()
    }
  })

  it('does not count a guesser against an unknown address differently from a known one', async () => {
    const from = '203.0.113.77'
    const unknown = freshEmail('nobody')
    for (let i = 0; i <= rule.freeFailures; i++) expect((await login(unknown, 'guess', from)).status).toBe(401)
    expect((await login(unknown, 'guess', from)).status).toBe(429)
  })

  it('limits one address over all accounts, more loosely', async () => {
    const crowded = '192.0.2.44'
    const owner = await signUp('office')
    const limit = LOGIN_THROTTLE.address.freeFailures + 1
    await query('INSERT INTO throttle_counters (`key`, hits, first_at, last_at) VALUES (?, ?, NOW(3), NOW(3))', [`login:address:${crowded}`, limit])
    const refused = await login(owner.user.email, owner.password, crowded)
    expect(refused.status).toBe(429)
    expect((await login(owner.user.email, owner.password, '192.0.2.45')).status).toBe(200)
  })
})
