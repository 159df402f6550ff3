// Fitting in Chromium: an editor uploads a CSV of a titration, sees it
// listed with a preview, fits the constant the text marks `fit`, reads the
// value ± standard error with the curve and residuals, and uses the values:
// the new revision's constants table shows the fitted value, its ± and the
// data set cited by name and SHA-256. The data (tests/fixtures/fit.ts) are made from pKa 4.76
// with a fixed alternating error of ±0.005.
import { createHash } from 'node:crypto'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'
import { WEAK_ACID_CSV, weakAcidTitration } from '../fixtures/fit'

await useBuiltServer()

const acid = weakAcidTitration
const CSV = WEAK_ACID_CSV
const SHA = createHash('sha256').update(CSV).digest('hex')

describe('fitting in the workbench', () => {
  it('uploads a data set, fits, applies, and shows the new revision with the citation and the ±', async () => {
    const owner = await signUp('fitter')
    const lab = await makeLab(owner)
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Weak acid', slug: 'weak-acid', source: acid('4.40 fit') } })).status).toBe(201)
    const dir = mkdtempSync(join(tmpdir(), 'fit-e2e-'))
    const file = join(dir, 'acid-titration.csv')
    writeFileSync(file, CSV)

    const page = await openSignedIn(`/labs/${lab}/systems/weak-acid`, owner.cookie)
    await page.setViewportSize({ width: 1280, height: 900 })
    await page.locator('[data-test=datasets-empty]').waitFor()
    await page.locator('[data-test=dataset-file]').setInputFiles(file)
    await page.locator('[data-test=dataset-upload-button]').click()
    await page.locator('[data-test="dataset-acid-titration"]').waitFor()
    const preview = page.locator('[data-test=dataset-preview] table')
    await preview.waitFor()
    await expect(preview.locator('thead th').allTextContents()).resolves.toEqual(['volume mL', 'pH'])
    await expect(preview.locator('tbody tr').count()).resolves.toBe(8)

    await page.locator('[data-test=fit-button]').click()
    const summary = page.locator('[data-test=fit-summary]')
    await summary.waitFor()
    await expect(summary.textContent()).resolves.toMatch(/Converged after \d+ iterations?:\s+1 constant fitted to 20 measured values; s = [\d.]+,\s+19 degrees of freedom\./)
    const fitted = await page.locator('[data-test=fit-constants] tbody td').allTextContents()
    expect(fitted[0]).toBe('CH3COOH <=> CH3COO- + H+')
    expect(fitted[1]).toBe('pKa')
    const [, value, error] = /^(4\.7\d+) ± (0\.0\d+)$/.exec(fitted[2]!.trim()) ?? []
    expect(Math.abs(Number(value) - 4.76)).toBeLessThan(3 * Number(error))
    await expect(page.locator('[data-test=fit-curve] circle').count()).resolves.toBe(20)
    await expect(page.locator('[data-test=fit-residuals] circle').count()).resolves.toBe(20)
    await screenshot(page, 'fit-result')
    // On a phone the panel, its tables and charts stay within the page: nothing in it sticks out, and it widens the page by nothing.
    await page.setViewportSize({ width: 390, height: 844 })
    const widths = await page.evaluate(() => {
      const whole = document.documentElement.scrollWidth
      const panel = document.querySelector('[data-test=datasets]') as HTMLElement
      const inPanel = [...panel.querySelectorAll('*')].filter((el) => el.getBoundingClientRect().right > window.innerWidth + 1).map((el) => `${el.tagName.toLowerCase()}.${[...el.classList].join('.')}`)
      panel.style.display = 'none'
      const without = document.documentElement.scrollWidth
      panel.style.display = ''
      return { whole, without, inner: window.innerWidth, inPanel }
    })
    expect(widths.inPanel).toEqual([])
    expect(widths.whole).toBe(widths.without)
    await screenshot(page, 'fit-result-phone')
    await page.setViewportSize({ width: 1280, height: 900 })

    await page.locator('[data-test=apply-fit]').click()
    await page.getByText('Saved the fitted values as revision 2.').waitFor()
    await page.locator('[data-test=tab-report]').click()
    const row = page.locator('[data-test=constant-row]').filter({ hasText: 'CH3COOH' })
    await row.waitFor()
    const text = (await row.textContent())!.replace(/\s+/g, ' ')
    expect(text).toMatch(/pKa [\d.]+ ± [\d.]+\s*fit/)
    const [, written, spread] = /pKa ([\d.]+) ± ([\d.]+)\s*fit/.exec(text) ?? []
    expect(Number(written)).toBe(Number(value))
    expect(Number(spread)).toBe(Number(error))
    expect(text).toContain(`fitted to data set acid-titration (sha256 ${SHA})`)
    await screenshot(page, 'fit-applied')
  })
})
