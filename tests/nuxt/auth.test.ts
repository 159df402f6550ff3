// Accounts against the built server and the real MariaDB: register with a
// confirmed address, sign in, one message for every wrong credential, sign
// out, password change. Throttling and session lifetimes: sessions.test.ts.
import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import mysql from 'mysql2/promise'
import { api, confirmationToken, freshClientAddress, freshEmail, sessionCookie, signIn, signUp } from '../setup/accounts'
import { REGISTRATIONS_PER_ADDRESS_PER_HOUR } from '../../server/utils/limits'
import { waitForMail } from '../setup/mail'
import { TEST_DATABASE_URL } from '../setup/test-database'

await useBuiltServer()

describe('register', () => {
  it('answers a new and an existing address alike, and creates the account only from the mailed link', async () => {
    const existing = await signUp('existing')
    const email = freshEmail('reg')
    const forNew = await api('/api/auth/register', { method: 'POST', body: { email: email.toUpperCase(), name: 'Rosa', password: 'ten chars!!' } })
    const forExisting = await api('/api/auth/register', { method: 'POST', body: { email: existing.user.email, name: 'Other', password: 'another password' } })
    expect(forNew.status).toBe(202)
    expect(forExisting.status).toBe(202)
    expect(forExisting.body).toEqual(forNew.body)
    expect(forNew.body.message).toMatch(/Check your mail/)
    expect(forNew.headers.getSetCookie()).toEqual([])
    expect(forExisting.headers.getSetCookie()).toEqual([])

    // The existing account's owner hears that someone tried; their password is unchanged.
    const notice = await waitForMail(existing.user.email, /Someone tried to create an Equipoise account/)
    expect(notice.text).toContain('already has one. Nothing was changed')
    await expect(signIn(existing.user.email, 'another password')).rejects.toThrow(/401/)
    await expect(signIn(existing.user.email, existing.password)).resolves.toMatchObject({ user: { id: existing.user.id } })

    // The new address cannot sign in until it opens the link.
    const token = await confirmationToken(email)
    expect((await api('/api/auth/login', { method: 'POST', body: { email, password: 'ten chars!!' } })).status).toBe(401)
    expect((await api(`/register/confirm?token=${token}`)).status).toBe(200)
    const confirmed = await api('/api/auth/register/confirm', { method: 'POST', body: { token } })
    expect(confirmed.status).toBe(201)
    expect(confirmed.body.user).toMatchObject({ email, name: 'Rosa', isAdmin: false })
    const me = await api('/api/me', { cookie: sessionCookie(confirmed.headers) })
    expect(me.status).toBe(200)
    expect(me.body.user.email).toBe(email)
    await expect(signIn(email, 'ten chars!!')).resolves.toMatchObject({ user: { email } })

    const again = await api('/api/auth/register/confirm', { method: 'POST', body: { token } })
    expect(again.status).toBe(410)
    expect(again.body.message).toMatch(/already used; sign in/)
  })

  it('refuses a made-up and an expired confirmation link, saying what to do', async () => {
    const madeUp = await api('/api/auth/register/confirm', { method: 'POST', body: { token: 'B'.repeat(43) } })
    expect(madeUp.status).toBe(404)
    expect(madeUp.body.message).toMatch(/register again/)
    const email = freshEmail('late')
    expect((await api('/api/auth/register', { method: 'POST', body: { email, name: 'Late', password: 'a long enough password' } })).status).toBe(202)
    const token = await confirmationToken(email)
    const connection = await mysql.createConnection(TEST_DATABASE_URL)
    await connection.query('UPDATE pending_registrations SET expires_at = NOW(3) - INTERVAL 1 MINUTE WHERE email = ?', [email])
    await connection.end()
    const late = await api('/api/auth/register/confirm', { method: 'POST', body: { token } })
    expect(late.status).toBe(410)
    expect(late.body.message).toMatch(/expired .*register again/)
  })

  it('limits registrations from one client address in an hour, with a 429 saying when to try again', async () => {
    const from = freshClientAddress()
    const register = (address: string) => api('/api/auth/register', {
      method: 'POST', body: { email: freshEmail('many'), name: 'Many', password: 'a long enough password' }, headers: { 'x-forwarded-for': address },
    })
    for (let i = 0; i < REGISTRATIONS_PER_ADDRESS_PER_HOUR; i++) expect((await register(from)).status).toBe(202)
    const refused = await register(from)
    expect(refused.status).toBe(429)
    expect(refused.body.message).toMatch(/^Too many registrations from your network in the last hour \(at most 10\)\. Try again in \d+ minutes/)
    expect(Number(refused.headers.get('retry-after'))).toBeGreaterThan(3500)
    expect((await register(freshClientAddress())).status).toBe(202)
  })

  it('says what to change for a bad e-mail and a short password', async () => {
    const answer = await api('/api/auth/register', { method: 'POST', body: { email: 'not-an-address', name: 'X', password: 'short' } })
    expect(answer.status).toBe(400)
    const fields = answer.body.data.issues.map((i: { path: string }) => i.path)
    expect(fields).toEqual(expect.arrayContaining(['email', 'password']))
    expect(answer.body.message).toMatch(/e-mail address/i)
  })

  it('answers 400, not 500, to a body that is not JSON', async () => {
    const response = await fetch(url('/api/auth/register'), {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: '{not json',
    })
    expect(response.status).toBe(400)
  })
})

describe('sign in', () => {
  it('signs in with the right password', async () => {
    const account = await signUp('login')
    const session = await signIn(account.user.email, account.password)
    const me = await api('/api/me', { cookie: session.cookie })
    expect(me.body.user.id).toBe(account.user.id)
  })

  it('gives the same 401 message for a wrong password and an unknown e-mail', async () => {
    const account = await signUp('wrong')
    const wrongPassword = await api('/api/auth/login', { method: 'POST', body: { email: account.user.email, password: 'not the password' } })
    const unknownEmail = await api('/api/auth/login', { method: 'POST', body: { email: freshEmail('nobody'), password: 'not the password' } })
    expect(wrongPassword.status).toBe(401)
    expect(unknownEmail.status).toBe(401)
    expect(wrongPassword.body.message).toBe(unknownEmail.body.message)
    expect(wrongPassword.headers.getSetCookie()).toEqual([])
  })
})

describe('session', () => {
  it('answers 401 to /api/me when signed out', async () => {
    const me = await api('/api/me')
    expect(me.status).toBe(401)
    expect(me.body.message).toMatch(/Sign in/)
  })

  it('signs out by clearing the cookie', async () => {
    const account = await signUp('logout')
    const out = await api('/api/auth/logout', { method: 'POST', cookie: account.cookie })
    expect(out.status).toBe(200)
    const cleared = out.headers.getSetCookie().find((c) => c.startsWith('nuxt-session='))
    expect(cleared).toMatch(/nuxt-session=;|Max-Age=0|Expires=Thu, 01 Jan 1970/)
  })

  it('changes the password only with the current one, and the new one then works', async () => {
    const account = await signUp('pw')
    const refused = await api('/api/auth/password', { method: 'POST', cookie: account.cookie, body: { currentPassword: 'wrong one', newPassword: 'brand new secret' } })
    expect(refused.status).toBe(400)
    expect(refused.body.data.issues[0].path).toBe('currentPassword')
    const changed = await api('/api/auth/password', { method: 'POST', cookie: account.cookie, body: { currentPassword: account.password, newPassword: 'brand new secret' } })
    expect(changed.status).toBe(200)
    await expect(signIn(account.user.email, account.password)).rejects.toThrow(/401/)
    await expect(signIn(account.user.email, 'brand new secret')).resolves.toMatchObject({ user: { id: account.user.id } })
  })
})
