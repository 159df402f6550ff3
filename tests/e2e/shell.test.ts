// The whole first visit in Chromium: register and confirm the address from
// the mail, sign out and in again, create a lab, invite a member, create a
// system, sign out. Screenshots of the lab and
// members pages go to test-results/ for a person to look at.
import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { api, freshEmail, signUp } from '../setup/accounts'
import { linkTo, waitForMail } from '../setup/mail'
import { openPage, openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

describe('first visit in the browser', () => {
  it('registers and confirms, signs in, creates a lab, invites a member, creates a system and signs out', async () => {
    const colleague = await signUp('colleague')
    const email = freshEmail('browser')
    const password = 'a browser password'

    const page = await openPage('/register')
    await page.getByLabel('Name').fill('Bea Browser')
    await page.getByLabel('E-mail').fill(email)
    await page.getByLabel('Password').fill(password)
    await page.getByRole('button', { name: 'Create account' }).click()
    await page.locator('[data-test=register-requested]').getByText(`We sent a mail to ${email}`).waitFor()
    await screenshot(page, 'register-check-mail')

    // The account exists once the mailed link is opened and confirmed.
    await page.goto(url(linkTo(await waitForMail(email, /^Confirm your address/), '/register/confirm')))
    await page.getByRole('button', { name: 'Confirm and sign in' }).click()
    await page.getByRole('heading', { name: 'My labs' }).waitFor()

    // Sign out, then back in through the form.
    await page.locator('[data-test=user-menu]').click()
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(url('/login'))
    await page.getByLabel('E-mail').fill(email)
    await page.getByLabel('Password').fill('not my password')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect(page.getByRole('alert').textContent()).resolves.toContain('E-mail or password is incorrect')
    await screenshot(page, 'sign-in-refused')
    await page.getByLabel('Password').fill(password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.getByRole('heading', { name: 'My labs' }).waitFor()
    await screenshot(page, 'my-labs-empty')

    // A lab: the address is suggested from the name.
    const lab = page.locator('[data-test=lab-create]')
    await lab.getByLabel('Name').fill('Anodising line')
    await expect(lab.getByLabel('Address').inputValue()).resolves.toBe('anodising-line')
    const labSlug = `anodising-${Date.now().toString(36)}`
    await lab.getByLabel('Address').fill(labSlug)
    await lab.getByRole('button', { name: 'Create lab' }).click()
    await page.waitForURL(url(`/labs/${labSlug}`))
    await page.getByRole('heading', { name: 'Anodising line' }).waitFor()
    await page.getByText('No systems yet').waitFor()

    // A member, by invitation: they join when they accept it.
    await page.getByRole('link', { name: '1 member' }).click()
    await page.waitForURL(url(`/labs/${labSlug}/members`))
    const invite = page.locator('[data-test=invite]')
    await invite.getByLabel('E-mail').fill(colleague.user.email)
    await invite.getByLabel('Role').selectOption('editor')
    await invite.getByRole('button', { name: 'Send invitation' }).click()
    await invite.getByText(`Invitation sent to ${colleague.user.email} as editor.`).waitFor()
    const token = new URL(linkTo(await waitForMail(colleague.user.email, /invites you to/), '/invitations/accept'), 'http://x').searchParams.get('token')
    expect((await api('/api/invitations/accept', { method: 'POST', cookie: colleague.cookie, body: { token } })).status).toBe(200)
    await page.reload()
    await page.locator('[data-test=members]').getByText(colleague.user.email).waitFor()
    await screenshot(page, 'members-page')

    // A system, with a bad address first to see the inline message.
    await page.getByRole('navigation', { name: 'Breadcrumb' }).getByRole('link', { name: 'Anodising line' }).click()
    await page.waitForURL(url(`/labs/${labSlug}`))
    const system = page.locator('[data-test=system-create]')
    await system.getByLabel('Title').fill('Sealing bath')
    await system.getByLabel('Address').fill('Sealing Bath')
    await system.getByRole('button', { name: 'Create system' }).click()
    await system.getByText('Use lower-case letters, digits and dashes').first().waitFor()
    await system.getByLabel('Address').fill('sealing-bath')
    await system.getByRole('button', { name: 'Create system' }).click()
    await page.getByRole('link', { name: 'Sealing bath' }).waitFor()
    await page.getByRole('link', { name: '2 members' }).waitFor()
    await screenshot(page, 'lab-page')

    await page.getByRole('link', { name: 'Sealing bath' }).click()
    await page.waitForURL(url(`/labs/${labSlug}/systems/sealing-bath`))
    await page.getByRole('heading', { name: 'Sealing bath' }).waitFor()
    await expect(page.locator('.cm-content').innerText()).resolves.toMatch(/^system "Sealing bath"/)

    await page.locator('[data-test=user-menu]').click()
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(url('/login'))
    // Signed out, the lab sends us back to sign-in.
    await page.goto(url(`/labs/${labSlug}`))
    await page.waitForURL(/\/login\?next=/)
  })

  it('shows the 404 page for a lab the user is not a member of', async () => {
    const stranger = await signUp('stranger')
    const page = await openSignedIn('/labs/demo', stranger.cookie)
    await page.getByRole('heading', { name: 'Nothing here' }).waitFor()
    await screenshot(page, 'not-found')
  })
})
