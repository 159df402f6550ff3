// Help where you write, in Chromium: completion that types the space after a
// keyword and offers the formulas not declared yet, hover on a keyword and on
// a number with its unit, and F1 (and the link under the editor) opening the
// language reference at the statement of the cursor's line.
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { signInAs } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

describe('help in the editor', () => {
  it('completes, hovers and opens the reference at the cursor', async () => {
    const editor = await signInAs('editor')
    const page = await openSignedIn('/labs/demo/systems/copper-rinse-tank', editor.cookie)
    await page.setViewportSize({ width: 1280, height: 900 })
    await page.locator('.cm-content').waitFor()

    // The link under the editor follows the cursor's statement.
    await page.locator('.cm-line', { hasText: 'reaction NH4+' }).first().click()
    const link = page.getByTestId('reference-link')
    await expect(link.textContent()).resolves.toBe('Reference: reaction')
    await expect(link.getAttribute('href')).resolves.toBe('/reference#reaction')

    // F1 opens the reference there, in a new tab, and the statement's heading is the target.
    const [reference] = await Promise.all([page.context().waitForEvent('page'), page.keyboard.press('F1')])
    await reference.waitForLoadState()
    expect(new URL(reference.url()).pathname + new URL(reference.url()).hash).toBe('/reference#reaction')
    await expect(reference.locator('h3#reaction').textContent()).resolves.toContain('reaction LEFT')
    await reference.close()

    // Completion: a statement word is accepted with the space after it, then the formulas the reactions use
    // that no component declares (none here: every formula is a component or made by a reaction).
    await page.locator('.cm-content').click()
    await page.keyboard.press('Control+End')
    await page.keyboard.type('\nreaction Cu^2+ + ')
    await page.locator('.cm-tooltip-autocomplete').waitFor()
    const offered = await page.locator('.cm-tooltip-autocomplete li').allTextContents()
    expect(offered.some((o) => o.startsWith('NH3'))).toBe(true)
    await page.keyboard.press('Escape')
    await page.keyboard.type('NH3 <=> CuNH3^2+ ')
    await page.keyboard.press('Control+Space')
    await page.locator('.cm-tooltip-autocomplete').waitFor()
    // Only the kinds that fit a formation from components.
    const kinds = (await page.locator('.cm-tooltip-autocomplete li').allTextContents()).map((o) => o.replace(/constant$/, ''))
    expect(kinds.sort()).toEqual(['K', 'beta', 'logK', 'logbeta', 'pK'])
    await page.keyboard.press('Escape')
    await page.keyboard.type('\ntemp')
    await page.locator('.cm-tooltip-autocomplete li[aria-selected]', { hasText: 'temperature' }).waitFor()
    await page.keyboard.press('Enter')
    const lines = await page.locator('.cm-line').allTextContents()
    expect(lines.filter((l) => l.startsWith('temperature'))).toEqual(['temperature 25 C', 'temperature '])
    await screenshot(page, 'editor-help-completion')

    // Hover on a number with its unit: the value in mol/L.
    await page.locator('.cm-line', { hasText: 'component Cu^2+' }).first().getByText('mmol/L').hover()
    const tooltip = page.locator('.cm-tooltip-hover')
    await tooltip.waitFor()
    await expect(tooltip.textContent()).resolves.toContain('= 0.0015 mol/L')
    await screenshot(page, 'editor-help-hover')
  }, 120_000)
})
