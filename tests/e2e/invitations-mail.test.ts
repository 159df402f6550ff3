// In the browser: a newcomer follows the invitation link from the captured
// mail, creates the account there and lands in the lab; a used link shows
// why it no longer works; a forgotten password is reset from its mail link;
// the administrator reads the captured mail; a library page lists its users.
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, freshEmail, makeLab, signIn, signInAs, signUp } from '../setup/accounts'
import { openPage, openSignedIn, screenshot } from '../setup/browser'
import { linkTo, waitForMail } from '../setup/mail'

await useBuiltServer()

describe('mail links in the browser', () => {
  it('joins a lab from the invitation link by creating the account, and refuses the link the second time', async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    const email = freshEmail('newcomer')
    const invited = await api(`/api/labs/${lab}/invitations`, { method: 'POST', cookie: owner.cookie, body: { email, role: 'editor' } })
    expect(invited.status).toBe(201)
    const link = linkTo(await waitForMail(email, /invites you to/), '/invitations/accept')

    const page = await openPage(link)
    await page.getByText(`invites ${email} to join`).waitFor()
    await page.getByLabel('Name').fill('Nora Newcomer')
    await page.getByLabel('Password').fill('a long enough password')
    await screenshot(page, 'invitation-register')
    await page.getByRole('button', { name: 'Create account and join' }).click()
    await page.waitForURL(`**/labs/${lab}`)
    await page.getByRole('heading', { name: `Lab ${lab}` }).waitFor()
    expect(await page.getByText('You are editor').isVisible()).toBe(true)

    const again = await openPage(link)
    const refusal = again.locator('[data-test="invitation-refused"]')
    await refusal.waitFor()
    expect(await refusal.textContent()).toMatch(/already used .* works once/)
    await screenshot(again, 'invitation-used')
  })

  it('sets a new password from the reset mail', async () => {
    const me = await signUp('forgetful')
    const forgot = await openPage('/password/forgot')
    await forgot.getByLabel('E-mail').fill(me.user.email)
    await forgot.getByRole('button', { name: 'Send the link' }).click()
    await forgot.getByRole('status').waitFor()
    expect(await forgot.getByRole('status').textContent()).toMatch(/If an account uses this address/)

    const link = linkTo(await waitForMail(me.user.email, /new password/), '/password/reset')
    const reset = await openPage(link)
    await reset.getByLabel('New password').fill('a fresh long passphrase')
    await reset.getByRole('button', { name: 'Save the new password' }).click()
    await reset.getByText('Your password is changed.').waitFor()
    await expect(signIn(me.user.email, 'a fresh long passphrase')).resolves.toBeTruthy()
  })

  it('shows captured mail to the administrator, with the link to follow', async () => {
    const me = await signUp('reader')
    await api('/api/auth/password/forgot', { method: 'POST', body: { email: me.user.email } })
    await waitForMail(me.user.email, /new password/)
    const admin = await signInAs('admin')
    const page = await openSignedIn('/admin/mail', admin.cookie)
    const item = page.locator('[data-test="captured-mail"] li', { hasText: `to ${me.user.email}` }).first()
    await item.getByRole('button').click()
    expect(await item.getByRole('link').first().getAttribute('href')).toMatch(/\/password\/reset\?token=/)
    await screenshot(page, 'admin-mail')

    const other = await openSignedIn('/admin/mail', me.cookie)
    await other.getByRole('heading', { name: 'Nothing here' }).waitFor()
  })

  it('invites from the members page and shows the invitation as pending', async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    const email = freshEmail('colleague')
    const page = await openSignedIn(`/labs/${lab}/members`, owner.cookie)
    const form = page.locator('[data-test="invite"]')
    await form.getByLabel('E-mail').fill(email)
    await form.getByLabel('Role').selectOption('reviewer')
    await form.getByRole('button', { name: 'Send invitation' }).click()
    await form.getByRole('status').waitFor()
    expect(await form.getByRole('status').textContent()).toContain(`Invitation sent to ${email} as reviewer`)
    await page.locator('[data-test="invitations"] li', { hasText: email }).getByText(/reviewer · until/).waitFor()
    expect((await waitForMail(email, /invites you to/)).text).toContain('as reviewer')
    await screenshot(page, 'members-invite')
  })

  it('imports a .poise file from the lab page as a new system', async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    const page = await openSignedIn(`/labs/${lab}`, owner.cookie)
    const form = page.locator('[data-test="import"]')
    await form.locator('input[type="file"]').setInputFiles({ name: 'bath.poise', mimeType: 'text/plain', buffer: Buffer.from('system "Nickel bath, line 4"\ncomponent H+ balance\n') })
    await form.getByRole('button', { name: 'Import' }).click()
    await form.getByRole('status').waitFor()
    expect(await form.getByRole('status').textContent()).toContain('Imported as “Nickel bath, line 4”')
    await page.getByRole('link', { name: 'Nickel bath, line 4' }).waitFor()

    await form.locator('input[type="file"]').setInputFiles({ name: 'latin1.poise', mimeType: 'text/plain', buffer: Buffer.from([0x73, 0x79, 0x73, 0xb2, 0x0a]) })
    await form.getByRole('button', { name: 'Import' }).click()
    await form.getByRole('alert').waitFor()
    expect(await form.getByRole('alert').textContent()).toMatch(/not UTF-8 text/)
    await screenshot(page, 'lab-import')
  })

  it('shares a system as a lab library from the workbench', async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Carbonate constants', slug: 'carbonates' } })
    const page = await openSignedIn(`/labs/${lab}/systems/carbonates`, owner.cookie)
    const mark = page.locator('[data-test="library-mark"]')
    await mark.getByRole('button', { name: 'Share as a lab library' }).click()
    await mark.getByRole('link', { name: 'Who uses it' }).waitFor()
    expect(await mark.textContent()).toContain('use "carbonates"')
    const list = await api(`/api/labs/${lab}/libraries`, { cookie: owner.cookie })
    expect(list.body.libraries).toEqual([{ name: 'carbonates', title: 'Carbonate constants', latestRevision: 1 }])
  })

  it("lists on a library's page the systems that use it and the revision they ask for", async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    const library = 'system "Water"\ncomponent H+ balance\nreaction H2O <=> H+ + OH- pKw 14 cite "water (from memory)"\n'
    await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Water constants', slug: 'water', source: library } })
    await api(`/api/labs/${lab}/systems/water/library`, { method: 'PUT', cookie: owner.cookie, body: { isLibrary: true } })
    await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Rinse water', slug: 'rinse', source: 'system "Rinse"\ncomponent H+ balance\nuse "water" @ 1\n' } })

    const page = await openSignedIn(`/labs/${lab}/libraries/water`, owner.cookie)
    const row = page.locator('[data-test="library-users"] tr', { hasText: 'Rinse water' })
    await row.waitFor()
    expect(await row.textContent()).toContain('revision 1')
    await screenshot(page, 'library-page')
  })
})
