// The workbench in Chromium: an example of the demo lab is broken, fixed,
// saved and run; a sweep line turns it into a diagram; the CSV download and
// the printable report are read back. Screenshots go to test-results/.
import { readFile } from 'node:fs/promises'
import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import type { Page } from 'playwright-core'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signInAs, signUp } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

/**
 * Select the editor line holding `text` (Alt+L selects whole lines, wrapped or not) and type over
 * it; Escape closes a completion list first, so Enter ends the line instead of taking a suggestion.
 */
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

async function openWorkbench(page: Page) {
  await page.locator('.cm-content').waitFor()
  await page.setViewportSize({ width: 1280, height: 900 })
}

describe('the workbench', () => {
  it('checks, saves, runs, sweeps and exports an example of the demo lab', async () => {
    const editor = await signInAs('editor')
    const page = await openSignedIn('/labs/demo/systems/phosphate-buffer-recipe', editor.cookie)
    await openWorkbench(page)
    await page.getByRole('navigation', { name: 'Breadcrumb' }).getByText('revision 1').waitFor()
    // No run of revision 1 is stored: opening shows a preview of it at once, and says it is not stored.
    await page.locator('[data-test=preview-label]').getByText('Preview of revision 1 — not stored. No run of this revision is stored yet, so it was solved on opening.').waitFor()
    await page.locator('[data-test=summary-ph]').waitFor()
    await screenshot(page, 'workbench-opened')

    // Break a reaction: the message appears in a block under its line, and the status line counts it.
    const line = 'reaction H2PO4- <=> HPO4^2- + H+'
    const intact = 'reaction H2PO4- <=> HPO4^2- + H+       pKa 7.20    cite "phosphoric acid, second step (from memory)"'
    await replaceLine(page, line, intact.replace('HPO4^2- + H+', 'HPO4^2-     '))
    const message = page.locator('.cm-poise-message-error').first()
    await message.waitFor()
    await expect(message.textContent()).resolves.toMatch(/does not balance/)
    await expect(page.getByTestId('status-errors').textContent()).resolves.toMatch(/^\s*[1-9]\d* errors?\s*$/)
    await screenshot(page, 'workbench-diagnostic')
    // Run anyway: the server refuses (422) and its diagnostics link to their line.
    await page.keyboard.press('Control+Enter')
    const problem = page.locator('[data-test=server-problem]')
    await problem.waitFor()
    await expect(problem.textContent()).resolves.toMatch(/Not solved\. The system has \d+ errors?/)
    await expect(problem.locator('[data-test=problem-diagnostic]').first().textContent()).resolves.toMatch(/^\s*Line 16: the reaction does not balance/)

    // Fix it, take the activity model to ideal (for a closed-form check) and drop the sweep: a single point.
    await replaceLine(page, 'reaction H2PO4- <=> HPO4^2-', intact)
    await replaceLine(page, 'activity davies', 'activity ideal')
    await replaceLine(page, 'sweep total Na+', '')
    // The checker runs a moment after typing stops.
    await page.locator('.cm-poise-message-error').first().waitFor({ state: 'detached' })
    await page.getByTestId('status-errors').getByText('0 errors').waitFor()
    await expect(page.locator('[data-test=run-hint]').textContent()).resolves.toMatch(/preview, not stored/)

    // Ctrl+S and Ctrl+Enter work in the note field too (not only in the editor).
    await page.locator('[data-test=revision-message]').fill('ideal solution, one point')
    await page.locator('[data-test=revision-message]').press('Control+s')
    await page.locator('[data-test=saved-note]').getByText('Saved as revision 2.').waitFor()
    await page.getByRole('navigation', { name: 'Breadcrumb' }).getByText('revision 2').waitFor()

    await page.locator('[data-test=revision-message]').press('Control+Enter')
    await page.locator('[data-test=run-note]').getByText(/^\s*Run \d+ of revision 2/).waitFor()
    // Equal NaH2PO4 and Na2HPO4: pH = pKa2 + log10([HPO4²⁻]/[H2PO4⁻]) (Henderson–Hasselbalch), with
    // Na 3.449 g/L / 22.990 g/mol (IUPAC atomic weight) = 150.02 mmol/L, so HPO4²⁻ 50.02 and H2PO4⁻ 49.98 mmol/L.
    const pH = Number(await page.locator('[data-test=summary-ph]').textContent())
    expect(pH).toBeCloseTo(7.2 + Math.log10(50.023 / 49.977), 2)
    const hpo4 = page.locator('[data-test=species-row]', { hasText: 'HPO₄²⁻' }).first()
    await expect(hpo4.locator('td').nth(1).textContent()).resolves.toMatch(/^\s*5\.00e-2\s*$/)
    await expect(page.getByTestId('status-solver-time').textContent()).resolves.toMatch(/solver \d/)
    await screenshot(page, 'workbench-species')

    // A sweep line: Ctrl+Enter in the editor solves the unsaved text as a preview.
    await page.locator('.cm-line').last().click()
    await page.keyboard.press('End')
    await page.keyboard.type('\nsweep total Na+ from 100 mmol/L to 200 mmol/L points 11')
    await page.keyboard.press('Control+Enter')
    await page.locator('[data-test=preview-label]').waitFor()
    await page.locator('[data-test=tab-diagram]').click()
    await page.locator('[data-test=diagram-plot] svg').first().waitFor()
    await screenshot(page, 'workbench-diagram-preview')

    // Saved with Ctrl+S and run again, the sweep is a stored run; its CSV is one row a point.
    await page.locator('.cm-content').click()
    await page.keyboard.press('Control+s')
    await page.locator('[data-test=saved-note]').getByText('Saved as revision 3.').waitFor()
    await page.locator('[data-test=run]').click()
    await page.locator('[data-test=run-note]').getByText(/of revision 3/).waitFor()
    await page.locator('[data-test=diagram-plot] svg').first().waitFor()
    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test=export-csv]').click()])
    expect(download.suggestedFilename()).toMatch(/^phosphate-buffer-recipe-rev3-run\d+\.csv$/)
    const csv = (await readFile((await download.path())!, 'utf8')).replace(/^\uFEFF/, '').trim().split('\r\n').map((row) => row.split(','))
    expect(csv).toHaveLength(12)
    expect(csv[0]![0]).toMatch(/Na\+/)
    const middle = csv[6]!
    expect(Number(middle[0])).toBeCloseTo(0.15, 12)
    // At 150 mmol/L sodium the same Henderson–Hasselbalch pH as above (H2PO4⁻ and HPO4²⁻ 50 mmol/L each).
    expect(Number(middle[csv[0]!.indexOf('pH')])).toBeCloseTo(7.2, 2)
    await screenshot(page, 'workbench-diagram-stored')

    // The printable report: revision, solver version, constants with their sources.
    await page.locator('[data-test=tab-report]').click()
    await page.locator('[data-test=report-link]').click()
    await page.waitForURL(/\/report\?run=\d+/)
    await page.locator('[data-test=report-solver]').getByText(/version \d+\.\d+\.\d+/).waitFor()
    await page.locator('[data-test=constants]').getByText('phosphoric acid, second step (from memory)').waitFor()
    await expect(page.locator('[data-test=report-source]').textContent()).resolves.toContain('sweep total Na+ from 100 mmol/L')
    await page.getByText('These numbers come from a model').waitFor()
    await screenshot(page, 'workbench-report')
    // On paper the controls go: no filter box, no download buttons, no navigation.
    await page.emulateMedia({ media: 'print' })
    await expect(page.locator('[data-test=species-filter]').isVisible()).resolves.toBe(false)
    await expect(page.locator('[data-test=export-svg]').isVisible()).resolves.toBe(false)
    await expect(page.locator('[data-test=print]').isVisible()).resolves.toBe(false)
    await expect(page.locator('[data-test=constants]').isVisible()).resolves.toBe(true)
    await screenshot(page, 'workbench-report-print')
  })

  it('lets a viewer run the saved revision as a preview that stores nothing, but not edit or save it', async () => {
    const viewer = await signInAs('viewer')
    const runsBefore = (await api('/api/labs/demo/systems/copper-rinse-tank/runs', { cookie: viewer.cookie })).body.runs.length
    const page = await openSignedIn('/labs/demo/systems/copper-rinse-tank', viewer.cookie)
    await openWorkbench(page)
    await expect(page.locator('.cm-content').getAttribute('contenteditable')).resolves.toBe('false')
    await expect(page.locator('[data-test=save]').count()).resolves.toBe(0)
    await expect(page.locator('[data-test=run-hint]').textContent()).resolves.toMatch(/You are viewer here: the text is read-only\. Run solves revision 1 as a preview; viewers' runs are not stored\./)
    await page.locator('[data-test=preview-label]').getByText(/solved on opening/).waitFor()
    await page.locator('[data-test=run]').click()
    await page.locator('[data-test=preview-label]').getByText('Preview of revision 1 — not stored. Viewers\' runs are previews: nothing is kept.').waitFor()
    await page.locator('[data-test=sweep-point]').waitFor()
    expect((await api('/api/labs/demo/systems/copper-rinse-tank/runs', { cookie: viewer.cookie })).body.runs.length).toBe(runsBefore)
    await screenshot(page, 'workbench-viewer')
  })

  it('shows the Run and Save keys where there is a keyboard, and not on a touch screen', async () => {
    const editor = await signInAs('editor')
    const desk = await openSignedIn('/labs/demo/systems/copper-rinse-tank', editor.cookie)
    await openWorkbench(desk)
    await expect(desk.locator('[data-test=run-key]').isVisible()).resolves.toBe(true)
    await expect(desk.locator('[data-test=save-key]').isVisible()).resolves.toBe(true)
    await expect(desk.getByTestId('status-run-key').isVisible()).resolves.toBe(true)
    const phone = await openSignedIn('/labs/demo/systems/copper-rinse-tank', editor.cookie, { hasTouch: true, isMobile: true, viewport: { width: 390, height: 844 } })
    await phone.locator('.cm-content').waitFor()
    await phone.locator('[data-test=run]').waitFor()
    await expect(phone.locator('[data-test=run-key]').isVisible()).resolves.toBe(false)
    await expect(phone.locator('[data-test=save-key]').isVisible()).resolves.toBe(false)
    await expect(phone.getByTestId('status-run-key').isVisible()).resolves.toBe(false)
    await screenshot(phone, 'workbench-touch')
  })

  it('shows both texts when a colleague saved first, and saves mine only when asked', async () => {
    const owner = await signUp('owner')
    const colleague = await signUp('colleague')
    const lab = await makeLab(owner, [{ who: colleague, role: 'editor' }])
    const source = 'system "Etch rinse"\nactivity ideal\ncomponent H+ total 1 mmol/L\ncomponent Cl- total 1 mmol/L\nreaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"\n'
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Etch rinse', slug: 'etch-rinse', source } })).status).toBe(201)

    const page = await openSignedIn(`/labs/${lab}/systems/etch-rinse`, owner.cookie)
    await openWorkbench(page)
    const theirs = source.replace('1 mmol/L\ncomponent Cl-', '2 mmol/L\ncomponent Cl-')
    expect((await api(`/api/labs/${lab}/systems/etch-rinse`, { method: 'PATCH', cookie: colleague.cookie, body: { source: theirs, message: 'more acid', baseRevision: 1 } })).status).toBe(200)

    await replaceLine(page, 'component Cl-', 'component Cl- total 5 mmol/L')
    await page.locator('[data-test=save]').click()
    const conflict = page.locator('[data-test=save-conflict]')
    await conflict.waitFor()
    await expect(conflict.locator('[data-test=conflict-mine]').textContent()).resolves.toContain('component Cl- total 5 mmol/L')
    await expect(conflict.locator('[data-test=conflict-theirs]').textContent()).resolves.toContain('component H+ total 2 mmol/L')
    await conflict.getByText('“more acid”').waitFor()
    await screenshot(page, 'workbench-conflict')
    // Nothing was overwritten: the colleague's revision is still the latest.
    expect((await api(`/api/labs/${lab}/systems/etch-rinse`, { cookie: owner.cookie })).body.system.latest.number).toBe(2)

    await conflict.locator('[data-test=conflict-keep-mine]').click()
    await page.locator('[data-test=saved-note]').getByText('Saved as revision 3.').waitFor()
    const latest = (await api(`/api/labs/${lab}/systems/etch-rinse`, { cookie: owner.cookie })).body.system.latest
    expect(latest.source).toContain('component Cl- total 5 mmol/L')
    expect(latest.source).toContain('component H+ total 1 mmol/L')
  })

  it('asks before leaving unsaved text, and offers it back as a draft on return', async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    const source = 'system "Anodising rinse"\nactivity ideal\ncomponent H+ total 1 mmol/L\ncomponent Cl- total 1 mmol/L\nreaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"\n'
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Anodising rinse', slug: 'anodising-rinse', source } })).status).toBe(201)
    const page = await openSignedIn(`/labs/${lab}/systems/anodising-rinse`, owner.cookie)
    await openWorkbench(page)
    await replaceLine(page, 'component Cl-', 'component Cl- total 4 mmol/L')
    const asked: string[] = []
    page.on('dialog', (dialog) => {
      asked.push(dialog.message())
      void dialog.accept()
    })
    await page.getByRole('navigation', { name: 'Breadcrumb' }).getByRole('link', { name: `Lab ${lab}` }).click()
    await page.waitForURL(url(`/labs/${lab}`))
    expect(asked).toEqual(['This system has unsaved changes. Leave anyway? (A draft stays in this browser.)'])
    await page.getByRole('link', { name: 'Anodising rinse' }).click()
    await page.getByTestId('draft-notice').waitFor()
    await expect(page.locator('.cm-content').textContent()).resolves.toContain('component Cl- total 4 mmol/L')
    await expect(page.locator('[data-test=save]').textContent()).resolves.toMatch(/Save as revision 2/)
    await screenshot(page, 'workbench-draft')
  })

  it('creates a system from an example', async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    const page = await openSignedIn(`/labs/${lab}`, owner.cookie)
    await page.getByRole('link', { name: 'Start from an example', exact: true }).click()
    await page.waitForURL(url(`/labs/${lab}/systems/new`))
    await page.locator('[data-test=start-zinc-sulfide-dosing]').check()
    await expect(page.getByLabel('Title').inputValue()).resolves.toBe('Zinc removal from a rinse water by sulfide dosing')
    await page.getByLabel('Title').fill('Zinc line 2')
    await expect(page.getByLabel('Address').inputValue()).resolves.toBe('zinc-line-2')
    await screenshot(page, 'workbench-new-system')
    await page.locator('[data-test=create-system]').click()
    await page.waitForURL(url(`/labs/${lab}/systems/zinc-line-2`))
    await page.locator('.cm-content').waitFor()
    await expect(page.locator('.cm-content').textContent()).resolves.toContain('system "Zinc line 2"')
    // The editor draws only the lines in view; the saved text is read back whole.
    const saved = (await api(`/api/labs/${lab}/systems/zinc-line-2`, { cookie: owner.cookie })).body.system.latest.source
    expect(saved).toContain('reaction ZnS(s) <=> Zn^2+ + S^2-')
    expect(saved).toMatch(/^system "Zinc line 2"\n# Sodium hydrosulfide/)
    // Before any run the report says what to do rather than showing empty tables.
    await page.goto(url(`/labs/${lab}/systems/zinc-line-2/report`))
    await expect(page.locator('[data-test=report-no-run]').textContent()).resolves.toMatch(/Revision 1 has no stored run yet\./)
    await expect(page.locator('[data-test=report-source]').textContent()).resolves.toContain('system "Zinc line 2"')
  })
})
