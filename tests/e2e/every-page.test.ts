// Every page of the app in Chromium, at a desktop width (1280 px) and a phone
// width (390 px): no console error, no uncaught page error, no Vue hydration
// warning, and at 390 px no sideways scroll. Screenshots of each page at each
// width go to test-results/every-page-*.png for a person to look at.
import { describe, expect, it } from 'vitest'
import { getBrowser, url, waitForHydration } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signInAs, signUp, SESSION_COOKIE } from '../setup/accounts'
import { openPage, screenshot, sidewaysOverflow } from '../setup/browser'

await useBuiltServer()

const WIDTHS = [{ width: 1280, height: 800 }, { width: 390, height: 844 }]

/** A small system of our own (demo values). */
const source = (logBeta: string) => `system "Copper ammine page check"
temperature 25 C
activity ideal
component Cu^2+  total 1.0 mmol/L
component NH3    free 1.0 mmol/L
reaction Cu^2+ + NH3 <=> CuNH3^2+   logbeta ${logBeta}   cite "demo value"
`

/**
 * Opens `path` at each width (signed in when `cookie` is given), waits for
 * hydration and for the network to settle, and returns every problem seen:
 * console errors, hydration warnings, page errors, and overflow at 390 px.
 */
async function problemsOn(path: string, name: string, cookie?: string): Promise<string[]> {
  const browser = await getBrowser()
  const problems: string[] = []
  for (const viewport of WIDTHS) {
    const context = await browser.newContext({ viewport })
    if (cookie) {
      await context.addCookies([{ name: SESSION_COOKIE, value: cookie.replace(`${SESSION_COOKIE}=`, ''), url: url('/'), httpOnly: true, secure: true, sameSite: 'Lax' }])
    }
    const page = await context.newPage()
    const at = `${path} at ${viewport.width}px`
    page.on('console', (message) => {
      const text = message.text()
      if (message.type() === 'error' || (message.type() === 'warning' && /hydrat/i.test(text))) problems.push(`${at}: console ${message.type()}: ${text}`)
    })
    page.on('pageerror', (error) => problems.push(`${at}: page error: ${error.message}`))
    await page.goto(url(path))
    await waitForHydration(page, url(path), 'hydration')
    await page.waitForLoadState('networkidle')
    if (viewport.width < 500) {
      const overflow = await sidewaysOverflow(page)
      if (overflow) problems.push(`${at}: ${overflow}`)
      // The breadcrumb shows one step on a phone, with room to read it (not squeezed to a letter or two).
      const crumbs = await page.evaluate(() => [...document.querySelectorAll('nav[aria-label="Breadcrumb"] li')]
        .filter((li) => li.getBoundingClientRect().width > 0)
        .map((li) => { const label = li.querySelector('a, span[aria-current], span:not([aria-hidden])') as HTMLElement | null; return { text: li.textContent?.trim() ?? '', shown: label?.clientWidth ?? 0, full: label?.scrollWidth ?? 0 } }))
      if (crumbs.length > 1) problems.push(`${at}: ${crumbs.length} breadcrumb steps on a phone (${crumbs.map((c) => c.text).join(' / ')})`)
      for (const c of crumbs) if (c.shown < Math.min(c.full, 120)) problems.push(`${at}: breadcrumb "${c.text}" squeezed to ${c.shown}px of ${c.full}px`)
    }
    await screenshot(page, `every-page-${name}-${viewport.width}`)
    await context.close()
  }
  return problems
}

describe('every page is clean', () => {
  it('signed out: home, sign-in, registration, password pages, invitation, API docs', async () => {
    const pages: [string, string][] = [
      ['/', 'home-signed-out'],
      ['/login', 'login'],
      ['/register', 'register'],
      ['/register/confirm?token=not-a-real-token', 'register-confirm'],
      ['/password/forgot', 'password-forgot'],
      ['/password/reset?token=not-a-real-token', 'password-reset'],
      ['/invitations/accept?token=not-a-real-token', 'invitation-accept'],
      ['/docs/api', 'docs-api'],
    ]
    const problems: string[] = []
    for (const [path, name] of pages) problems.push(...await problemsOn(path, name))
    expect(problems).toEqual([])
  }, 180_000)

  it('signed out: the language reference, the examples and one example', async () => {
    const pages: [string, string][] = [
      ['/reference', 'reference'],
      ['/examples', 'examples'],
      ['/examples/copper-rinse-tank', 'example-copper'],
    ]
    const problems: string[] = []
    for (const [path, name] of pages) problems.push(...await problemsOn(path, name))
    expect(problems).toEqual([])
  }, 120_000)

  it('the reference, the examples and an example\'s answer are readable signed out', async () => {
    const page = await openPage('/reference#component')
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toContain('Poise language reference')
    // Each statement has its anchor and its syntax diagram under the heading.
    await expect(page.locator('h3#component').count()).resolves.toBe(1)
    await expect(page.locator('h3#abbreviation + figure svg.railroad-diagram').count()).resolves.toBe(1)
    const home = await openPage('/')
    // The answer of a shipped example, computed by the server: the diagram of its sweep is drawn.
    await home.locator('section[aria-label="Result of the example"] section[aria-label="Diagram"] svg').first().waitFor({ timeout: 60_000 })
    const examples = await api('/api/examples/copper-rinse-tank/result')
    expect(examples.status).toBe(200)
    expect(examples.body.kind).toBe('sweep')
    expect(examples.body.result.points.length).toBe(51)
  })

  it('refuses with its own message: a bogus reset link is invalid, no field names, a 401 is not a server error', async () => {
    // A token not even of the form of one: the page says so before a password is typed.
    const page = await openPage('/password/reset?token=not-a-real-token')
    await expect(page.getByRole('alert').textContent()).resolves.toContain('This reset link is not valid')
    await expect(page.getByLabel('New password').count()).resolves.toBe(0)

    // A well-formed token nobody was sent: the server's refusal, in a sentence without the field's name.
    const unknown = 'A'.repeat(43)
    await page.goto(url(`/password/reset?token=${unknown}`))
    await waitForHydration(page, url(`/password/reset?token=${unknown}`), 'hydration')
    await page.getByLabel('New password').fill('a long enough password')
    await page.getByRole('button', { name: 'Save the new password' }).click()
    const refusal = await page.getByRole('alert').textContent()
    expect(refusal).toContain('This reset link is not valid')
    expect(refusal).not.toMatch(/token:/)
    await screenshot(page, 'every-page-reset-refused')

    const confirm = await openPage('/register/confirm?token=not-a-real-token')
    await expect(confirm.getByRole('alert').textContent()).resolves.toContain('This confirmation link is not valid')
    await expect(confirm.getByRole('button', { name: 'Confirm and sign in' }).count()).resolves.toBe(0)

    const malformed = await api('/api/auth/password/reset', { method: 'POST', body: { token: 'short', password: 'a long enough password' } })
    expect(malformed.status).toBe(400)
    expect(malformed.body.message).toBe('This link is not valid; open the whole link from the mail, or ask for a new one')
    expect(malformed.body.data.issues[0].path).toBe('token')

    const signedOut = await api('/api/me/recent-systems')
    expect(signedOut.status).toBe(401)
    expect(signedOut.body.statusMessage).toBe('Unauthorized')
    expect(JSON.stringify(signedOut.body)).not.toContain('Server Error')
  })

  it('signed in: home, settings, a lab, members, new system, workbench with a stored run, history, compare, report, a review, a library', async () => {
    const owner = await signUp('pages-owner')
    const reviewer = await signUp('pages-reviewer')
    const lab = await makeLab(owner, [{ who: reviewer, role: 'reviewer' }])
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Ammine rinse', slug: 'ammine', source: source('4.0') } })).status).toBe(201)
    expect((await api(`/api/labs/${lab}/systems/ammine`, { method: 'PATCH', cookie: owner.cookie, body: { source: source('5.0'), baseRevision: 1, message: 'newer constant' } })).status).toBe(200)
    const asked = await api(`/api/labs/${lab}/reviews`, { method: 'POST', cookie: owner.cookie, body: { system: 'ammine', from: 1, to: 2, reviewerId: reviewer.user.id } })
    expect(asked.status).toBe(201)
    const reviewId = asked.body.review?.id ?? asked.body.id
    expect(reviewId).toBeTypeOf('number')
    // A stored run (the workbench and history show it, with its date) and the system shared as a lab library.
    expect((await storeRunToEnd(`/api/labs/${lab}/systems/ammine/runs`, { cookie: owner.cookie, body: {} })).status).toBeLessThan(300)
    expect((await api(`/api/labs/${lab}/systems/ammine/library`, { method: 'PUT', cookie: owner.cookie, body: { isLibrary: true } })).status).toBe(200)

    const system = `/labs/${lab}/systems/ammine`
    const pages: [string, string][] = [
      ['/', 'home-signed-in'],
      ['/settings', 'settings'],
      [`/labs/${lab}`, 'lab'],
      [`/labs/${lab}/members`, 'members'],
      [`/labs/${lab}/systems/new`, 'system-new'],
      [system, 'workbench'],
      [`${system}/history`, 'history'],
      [`${system}/compare?from=1&to=2`, 'compare'],
      [`${system}/report`, 'report'],
      [`/labs/${lab}/reviews/${reviewId}`, 'review'],
      [`/labs/${lab}/libraries/ammine`, 'library'],
    ]
    const problems: string[] = []
    for (const [path, name] of pages) problems.push(...await problemsOn(path, name, owner.cookie))
    expect(problems).toEqual([])
  }, 180_000)

  it('as the site administrator: the admin pages and the demo lab', async () => {
    const admin = await signInAs('admin')
    const pages: [string, string][] = [
      ['/admin', 'admin'],
      ['/admin/mail', 'admin-mail'],
      ['/labs/demo', 'demo-lab'],
      ['/labs/demo/systems/copper-rinse-tank', 'demo-workbench'],
    ]
    const problems: string[] = []
    for (const [path, name] of pages) problems.push(...await problemsOn(path, name, admin.cookie))
    expect(problems).toEqual([])
  })
})
