// The whole workbench under the Content-Security-Policy (nuxt.config.ts): the
// editor and its lint messages and tooltips, the shipped fonts, a diagram and
// its SVG and PNG exports, with not one CSP violation in the browser.
import { readFile } from 'node:fs/promises'
import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

const SOURCE = [
  'system "Pickling rinse"',
  'activity ideal',
  'component H+ total 1 mmol/L',
  'component Cl- total 1 mmol/L',
  'reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"',
  'sweep total H+ from 0.1 mmol/L to 10 mmol/L points 9',
  '',
].join('\n')

/** Every CSP violation the page reports, from the DOM event and from the console. */
function watchViolations(page: Page): string[] {
  const seen: string[] = []
  page.on('console', (message) => {
    if (/Content Security Policy|Refused to (load|execute|apply|connect|frame)/i.test(message.text())) seen.push(`console: ${message.text()}`)
  })
  page.on('pageerror', (error) => {
    if (/Content Security Policy|EvalError/i.test(error.message)) seen.push(`error: ${error.message}`)
  })
  return seen
}

async function violationsInPage(page: Page): Promise<string[]> {
  return page.evaluate(() => ((window as unknown as { __csp?: string[] }).__csp ?? []))
}

describe('the app under its Content-Security-Policy', () => {
  it('edits, lints, solves, draws and exports with no violation', async () => {
    const owner = await signUp('csp')
    const lab = await makeLab(owner)
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Pickling rinse', slug: 'pickling-rinse', source: SOURCE } })).status).toBe(201)

    const page = await openSignedIn(`/labs/${lab}/systems/pickling-rinse`, owner.cookie)
    const fromConsole = watchViolations(page)
    // Record violations from the start of the next page load (an init script runs before the page's own).
    await page.addInitScript(() => {
      const list: string[] = []
      ;(window as unknown as { __csp: string[] }).__csp = list
      document.addEventListener('securitypolicyviolation', (e) => list.push(`${e.violatedDirective}: ${e.blockedURI} (${e.sourceFile}:${e.lineNumber})`))
    })
    await page.reload()
    await page.setViewportSize({ width: 1280, height: 900 })
    await page.locator('.cm-content').waitFor()
    // The app's own inline script ran (it hydrated): the Save button reacts to an edit.
    await page.locator('.cm-line', { hasText: 'component Cl-' }).click()
    await page.keyboard.press('End')
    await page.keyboard.type(' oops')
    const message = page.locator('.cm-poise-message-error').first()
    await message.waitFor()
    // The lint tooltip on the marked text.
    await page.locator('.cm-lintRange-error').first().hover()
    await page.locator('.cm-tooltip-lint, .cm-tooltip-hover').first().waitFor()
    await screenshot(page, 'csp-lint')
    for (let i = 0; i < ' oops'.length; i++) await page.keyboard.press('Backspace')
    await page.locator('.cm-poise-message-error').first().waitFor({ state: 'detached' })

    // The shipped fonts load.
    const fonts = await page.evaluate(async () => {
      await document.fonts.ready
      return [...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family.replace(/["']/g, ''))
    })
    expect(fonts).toContain('Inter')
    expect(fonts).toContain('JetBrains Mono')

    // Run the saved sweep and draw it.
    await page.keyboard.press('Control+Enter')
    await page.locator('[data-test=run-note]').getByText(/of revision 1/).waitFor()
    await page.locator('[data-test=tab-diagram]').click()
    await page.locator('[data-test=diagram-plot] svg').first().waitFor()
    await screenshot(page, 'csp-diagram')

    const [svg] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test=export-svg]').click()])
    expect(svg.suggestedFilename()).toMatch(/\.svg$/)
    expect(await readFile((await svg.path())!, 'utf8')).toMatch(/^<svg|<\?xml/)
    const [png] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test=export-png]').click()])
    expect(png.suggestedFilename()).toMatch(/\.png$/)
    const bytes = await readFile((await png.path())!)
    expect([...bytes.subarray(0, 4)]).toEqual([0x89, 0x50, 0x4e, 0x47])

    expect(await violationsInPage(page)).toEqual([])
    expect(fromConsole).toEqual([])
  })
})
