// In the browser: the settings page lists the sessions signed in elsewhere
// and signs them all out, keeping this one; a browser signed out that way is
// told why on the sign-in page.
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, signIn, signUp } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

describe('settings', () => {
  it('signs out all other sessions from the settings page', async () => {
    const me = await signUp('sessions')
    const elsewhere = await signIn(me.user.email, me.password)
    const page = await openSignedIn('/settings', me.cookie)
    const box = page.locator('[data-test=sessions]')
    await box.getByRole('heading', { name: 'Signed in elsewhere' }).waitFor()
    await box.getByText(/^Last active /).waitFor()
    await screenshot(page, 'settings-sessions')
    await box.getByRole('button', { name: 'Sign out all other sessions' }).click()
    await box.getByRole('status').waitFor()
    expect(await box.getByRole('status').textContent()).toBe('Signed out 1 other session.')
    await box.getByText('Only here: no other session is signed in.').waitFor()
    expect((await api('/api/me', { cookie: elsewhere.cookie })).status).toBe(401)
    expect((await api('/api/me', { cookie: me.cookie })).status).toBe(200)

    // The browser signed out from here is sent to sign in, and told why.
    const other = await openSignedIn('/settings', elsewhere.cookie)
    await other.waitForURL(/\/login\?next=/)
    const told = other.locator('[data-test=session-ended]')
    await told.waitFor()
    expect(await told.textContent()).toMatch(/^Your session has ended .*; sign in again$/)
    await screenshot(other, 'session-ended')
  })
})
