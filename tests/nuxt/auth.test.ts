// Accounts against the built server and the real MariaDB: register, sign in,
// one message for every wrong credential, throttling, sign out, password change.
import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { api, freshEmail, sessionCookie, signIn, signUp } from '../setup/accounts'

await useBuiltServer()

describe('register', () => {
  it('creates the account, signs it in and answers /api/me', async () => {
    const email = freshEmail('reg')
    const answer = await api('/api/auth/register', { method: 'POST', body: { email: email.toUpperCase(), name: 'Rosa', password: 'ten chars!!' } })
    expect(answer.status).toBe(201)
    expect(answer.body.user).toMatchObject({ email, name: 'Rosa', isAdmin: false })
    const me = await api('/api/me', { cookie: sessionCookie(answer.headers) })
    expect(me.status).toBe(200)
    expect(me.body.user.email).toBe(email)
  })

  it('refuses a second account for the same address with 409', async () => {
    const first = await signUp('dup')
    const again = await api('/api/auth/register', { method: 'POST', body: { email: first.user.email, name: 'Other', password: 'another password' } })
    expect(again.status).toBe(409)
    expect(again.body.message).toMatch(/sign in instead/)
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

  it('slows down repeated failures for one account with 429 and Retry-After, even for the right password', async () => {
    const account = await signUp('throttle')
    for (let i = 0; i < 5; i++) {
      const miss = await api('/api/auth/login', { method: 'POST', body: { email: account.user.email, password: `guess ${i}` } })
      expect(miss.status).toBe(401)
    }
    const blocked = await api('/api/auth/login', { method: 'POST', body: { email: account.user.email, password: account.password } })
    expect(blocked.status).toBe(429)
    expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)
    expect(blocked.body.message).toMatch(/Try again in \d+ minute/)
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
