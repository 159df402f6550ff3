// In the browser: the settings page makes an API token, shows its secret
// once, lists it and revokes it; the secret works until then.
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, signUp } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

describe('API tokens on the settings page', () => {
  it('makes a token, shows the secret once, lists and revokes it', async () => {
    const me = await signUp('token-page')
    const page = await openSignedIn('/settings', me.cookie)
    const box = page.locator('[data-test=api-tokens]')
    await box.getByRole('heading', { name: 'API tokens' }).waitFor()
    await box.getByText('No API tokens.').waitFor()
    await box.getByRole('button', { name: 'Make token' }).click()
    expect(await box.getByRole('alert').textContent()).toBe('Check the highlighted fields')
    await box.getByLabel('Name').fill('lab laptop')
    await box.locator('select[name=scope]').selectOption('write')
    await box.getByRole('button', { name: 'Make token' }).click()
    const secret = await box.locator('[data-test=token-secret]').textContent()
    expect(secret).toMatch(/^eqp_/)
    await box.getByRole('button', { name: 'Copy' }).waitFor()
    const row = box.locator('[data-test=token-list] tbody tr')
    await row.filter({ hasText: 'lab laptop' }).waitFor()
    expect(await row.textContent()).toMatch(/lab laptop\s*write.*never/)
    await screenshot(page, 'settings-tokens')
    expect((await api('/api/me', { headers: { authorization: `Bearer ${secret}` } })).status).toBe(200)

    page.once('dialog', (dialog) => dialog.accept())
    await row.getByRole('button', { name: 'Revoke' }).click()
    await box.getByText('No API tokens.').waitFor()
    expect(await box.locator('[data-test=token-secret]').count()).toBe(0)
    expect((await api('/api/me', { headers: { authorization: `Bearer ${secret}` } })).status).toBe(401)
  })
})
