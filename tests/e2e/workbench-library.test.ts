// The workbench with a lab library: the editor's checker finds a `use`d
// library (and still names a missing one), a preview of unsaved text solves
// with it, and the revision line leads to the history, the comparison with the
// previous revision and the report of an older revision.
import { beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

// Acetic acid, pKa 4.76 at 25 °C (handbook value, from memory).
const libraryText = `system "Acid constants"
component H+ balance
component CH3COO- total 10 mM
reaction H2O <=> H+ + OH- pKw 14 cite "water (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 cite "acetic acid (from memory)"
`
const consumerText = `system "Vinegar rinse"
use "acids"
component H+ balance
component CH3COO- total 10 mM
`

/** pH of a weak acid HA at total c from the exact quadratic [H+]² + Ka[H+] − Ka·c = 0, water neglected (textbook closed form). */
function weakAcidPH(pKa: number, c: number): number {
  const ka = 10 ** -pKa
  return -Math.log10((-ka + Math.sqrt(ka * ka + 4 * ka * c)) / 2)
}

/** Select the editor line holding `text` (Alt+L) and type over it (or delete it); Escape closes a completion list first. */
async function replaceLine(page: Page, text: string, replacement: string) {
  await page.locator('.cm-line', { hasText: text }).first().click()
  await page.keyboard.press('Alt+l')
  if (replacement === '') {
    await page.keyboard.press('Backspace')
    return
  }
  await page.keyboard.type(replacement)
  await page.keyboard.press('Escape')
  await page.keyboard.press('Enter')
}

let owner: SignedIn
let lab: string

beforeAll(async () => {
  owner = await signUp('librarian')
  lab = await makeLab(owner)
  for (const [slug, source] of [['acids', libraryText], ['vinegar', consumerText]] as const) {
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: slug, slug, source } })).status).toBe(201)
  }
  expect((await api(`/api/labs/${lab}/systems/acids/library`, { method: 'PUT', cookie: owner.cookie, body: { isLibrary: true } })).status).toBe(200)
})

describe('the workbench with a lab library', () => {
  it('checks a `use` against the lab in the editor and previews unsaved text with it', async () => {
    const page = await openSignedIn(`/labs/${lab}/systems/vinegar`, owner.cookie)
    await page.locator('.cm-content').waitFor()
    await page.setViewportSize({ width: 1280, height: 900 })
    // Once the library is loaded, the checker has nothing to say about the `use` line.
    await page.getByTestId('status-errors').getByText('0 errors').waitFor()
    await expect(page.locator('.cm-poise-message-error').count()).resolves.toBe(0)

    // A library the lab does not have is still an error under its line.
    await replaceLine(page, 'use "acids"', 'use "acids"\nuse "ghost"')
    const message = page.locator('.cm-poise-message-error').first()
    await message.waitFor()
    await expect(message.textContent()).resolves.toMatch(/there is no library "ghost"/)
    await screenshot(page, 'workbench-library-missing')

    // Drop it and dilute tenfold: the unsaved text solves as a preview, with the library's acid.
    await replaceLine(page, 'use "ghost"', '')
    await replaceLine(page, 'component CH3COO- total', 'component CH3COO- total 1 mM')
    await page.getByTestId('status-errors').getByText('0 errors').waitFor()
    // The preview solved on opening (10 mM) is still on show, and says it no longer matches the text.
    await page.locator('[data-test=preview-label]').getByText('Preview of revision 1').waitFor()
    await page.locator('[data-test=run-stale]').waitFor()
    await page.locator('[data-test=run]').click()
    // Only the answer for the edited text is labelled as current: a preview of unsaved text, not stale.
    await page.locator('[data-test=preview-label]').getByText('Preview of unsaved text').waitFor()
    await expect(page.locator('[data-test=run-stale]').count()).resolves.toBe(0)
    const pH = Number(await page.locator('[data-test=summary-ph]').textContent())
    expect(pH).toBeCloseTo(weakAcidPH(4.76, 0.001), 2)
    // The species table uses the solved text's model, library species included.
    await page.locator('[data-test=species-row]', { hasText: 'COOH' }).first().waitFor()
    await screenshot(page, 'workbench-library-preview')
  })

  it('links the revision line to the history and the previous revision, and reports an older revision', async () => {
    // Revision 1 is run and stored; revision 2 dilutes tenfold.
    expect((await storeRunToEnd(`/api/labs/${lab}/systems/vinegar/runs`, { cookie: owner.cookie, body: {} })).status).toBe(201)
    const diluted = consumerText.replace('10 mM', '1 mM')
    expect((await api(`/api/labs/${lab}/systems/vinegar`, { method: 'PATCH', cookie: owner.cookie, body: { source: diluted, message: 'diluted', baseRevision: 1 } })).status).toBe(200)

    const page = await openSignedIn(`/labs/${lab}/systems/vinegar`, owner.cookie)
    await page.locator('.cm-content').waitFor()
    await expect(page.locator('[data-test=compare-previous]').getAttribute('href')).resolves.toBe(`/labs/${lab}/systems/vinegar/compare?from=1&to=2`)
    await page.locator('[data-test=history-link]').click()
    await page.waitForURL(`**/labs/${lab}/systems/vinegar/history`)
    await page.getByRole('heading', { name: 'History of vinegar' }).waitFor()

    // Only revision 1 has a run, so only it has a report; it shows that revision's text and answer.
    await expect(page.locator('[data-revision="2"] [data-test=revision-report]').count()).resolves.toBe(0)
    await page.locator('[data-revision="1"] [data-test=revision-report]').click()
    await page.waitForURL(`**/labs/${lab}/systems/vinegar/report?revision=1`)
    await page.locator('[data-test=report-revision]').getByText(/not the latest: that is revision 2/).waitFor()
    await expect(page.locator('[data-test=report-source]').textContent()).resolves.toContain('component CH3COO- total 10 mM')
    await expect(page.locator('[data-test=report-libraries]').textContent()).resolves.toMatch(/acids revision 1/)
    const pH = Number(await page.locator('[data-test=summary-ph]').textContent())
    expect(pH).toBeCloseTo(weakAcidPH(4.76, 0.01), 2)
    await screenshot(page, 'report-older-revision')
  })
})
