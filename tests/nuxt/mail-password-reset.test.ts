// Password reset by mail: the link sets a new password once; the request
// answers the same for addresses with and without an account.
import { describe, expect, it } from 'vitest'
import mysql from 'mysql2/promise'
import { useBuiltServer } from '../setup/server'
import { TEST_DATABASE_URL } from '../setup/test-database'
import { api, freshEmail, signIn, signInAs, signUp } from '../setup/accounts'
import { capturedMail, linkTo, waitForMail } from '../setup/mail'

await useBuiltServer()

function tokenOf(link: string): string {
  return new URL(link, 'http://x').searchParams.get('token') ?? ''
}

describe('password reset', () => {
  it('mails a link that sets a new password once', async () => {
    const me = await signUp('forgetful')
    const asked = await api('/api/auth/password/forgot', { method: 'POST', body: { email: me.user.email.toUpperCase() } })
    expect(asked.status).toBe(202)
    const mail = await waitForMail(me.user.email, /new password/)
    const link = linkTo(mail, '/password/reset')
    expect((await api(link)).status).toBe(200)

    const reset = await api('/api/auth/password/reset', { method: 'POST', body: { token: tokenOf(link), password: 'a brand new passphrase' } })
    expect(reset.status).toBe(200)
    await expect(signIn(me.user.email, 'a brand new passphrase')).resolves.toMatchObject({ user: { email: me.user.email } })
    const old = await api('/api/auth/login', { method: 'POST', body: { email: me.user.email, password: me.password } })
    expect(old.status).toBe(401)

    const again = await api('/api/auth/password/reset', { method: 'POST', body: { token: tokenOf(link), password: 'someone elses passphrase' } })
    expect(again.status).toBe(410)
    expect(again.body.message).toMatch(/expired or was already used; ask for a new one/)
  })

  it('gives an unknown address the same answer and sends it nothing', async () => {
    const known = await signUp('known')
    const stranger = freshEmail('stranger')
    const forKnown = await api('/api/auth/password/forgot', { method: 'POST', body: { email: known.user.email } })
    const forStranger = await api('/api/auth/password/forgot', { method: 'POST', body: { email: stranger } })
    expect(forStranger.status).toBe(forKnown.status)
    expect(forStranger.body).toEqual(forKnown.body)
    await waitForMail(known.user.email, /new password/)
    expect(capturedMail().some((m) => m.to.includes(stranger))).toBe(false)
  })

  it('sends at most three reset links in a quarter of an hour, answering the same to the fourth request', async () => {
    const me = await signUp('impatient')
    const answers = []
    for (let i = 0; i < 4; i++) answers.push(await api('/api/auth/password/forgot', { method: 'POST', body: { email: me.user.email } }))
    expect(new Set(answers.map((a) => JSON.stringify([a.status, a.body]))).size).toBe(1)
    // The links are made after the answers: wait for the three mails, then for any fourth to have had its chance.
    for (let tries = 0; tries < 100 && capturedMail().filter((m) => m.to.includes(me.user.email) && /new password/.test(m.subject)).length < 3; tries++) await new Promise((r) => setTimeout(r, 100))
    await new Promise((r) => setTimeout(r, 1000))
    const connection = await mysql.createConnection(TEST_DATABASE_URL)
    const [rows] = await connection.query('SELECT COUNT(*) AS n FROM password_resets WHERE user_id = ?', [me.user.id])
    await connection.end()
    expect(Number((rows as Array<{ n: number }>)[0]!.n)).toBe(3)
    expect(capturedMail().filter((m) => m.to.includes(me.user.email) && /new password/.test(m.subject))).toHaveLength(3)
  })

  it('refuses a made-up token and a short password with messages saying what to do', async () => {
    const madeUp = await api('/api/auth/password/reset', { method: 'POST', body: { token: 'A'.repeat(43), password: 'a long enough password' } })
    expect(madeUp.status).toBe(404)
    expect(madeUp.body.message).toMatch(/not valid/)
    const truncated = await api('/api/auth/password/reset', { method: 'POST', body: { token: 'abc', password: 'a long enough password' } })
    expect(truncated.status).toBe(400)
    expect(truncated.body.message).toMatch(/open the whole link/)
    const short = await api('/api/auth/password/reset', { method: 'POST', body: { token: 'A'.repeat(43), password: 'short' } })
    expect(short.status).toBe(400)
    expect(short.body.data.issues).toContainEqual(expect.objectContaining({ path: 'password' }))
  })
})

describe('captured mail page', () => {
  it('lists captured mail for a site administrator and is not found for anyone else', async () => {
    const me = await signUp('reader')
    await api('/api/auth/password/forgot', { method: 'POST', body: { email: me.user.email } })
    await waitForMail(me.user.email, /new password/)
    const admin = await signInAs('admin')
    const list = await api('/api/admin/mail', { cookie: admin.cookie })
    expect(list.status).toBe(200)
    expect(list.body.messages).toContainEqual(expect.objectContaining({ to: [me.user.email], subject: 'Choose a new password for Equipoise' }))
    expect((await api('/api/admin/mail', { cookie: me.cookie })).status).toBe(404)
    expect((await api('/api/admin/mail')).status).toBe(401)
  })
})
