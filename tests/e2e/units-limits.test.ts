// The plating-shop question in Chromium: the shipped nickel rinse is run, the
// workbench states the pH window where dissolved nickel is at or below the
// 1 mg/L limit, the answer is switched to mg/L (nickel as Ni) and the
// dissolved total read from the Totals tab, and the diagram shades the
// window; the Shortcut tab sets the hand method beside the exact answer.
// Expected numbers come from the solver run here on the same file.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { signInAs } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'
import { compile } from '../../shared/poise/index'
import { sweep } from '../../server/solver/index'
import { limitSentence } from '../../shared/results/limits'
import { formatScientific } from '../../shared/results/typeset'

await useBuiltServer()

const model = compile(readFileSync(join(__dirname, '../../examples/nickel-rinse-discharge.poise'), 'utf8')).model!
const expected = sweep(model)

describe('results in the chemist\'s terms', () => {
  it('answers "where is dissolved nickel at or below 1 mg/L?" on one screen, in mg/L', async () => {
    const editor = await signInAs('editor')
    const page = await openSignedIn('/labs/demo/systems/nickel-rinse-discharge', editor.cookie)
    await page.locator('.cm-content').waitFor()
    await page.setViewportSize({ width: 1280, height: 900 })
    await page.locator('[data-test=run]').click()

    // The window, in words, located by exact solves (the same sentence the solver's own answer gives here).
    const sentence = page.locator('[data-test=limit-sentence]')
    await sentence.waitFor()
    const words = limitSentence(expected, expected.limits![0]!)
    expect(words).toMatch(/^dissolved Ni ≤ 1 mg\/L from pH 9\.6\d to 12\.3\d$/)
    await expect(sentence.textContent()).resolves.toBe(words)

    // mg/L, nickel as Ni; then the point at pH 10.00 and its dissolved total on the Totals tab.
    await page.locator('[data-test=output-unit]').selectOption('mg/L')
    await page.locator('[data-test=as-element]').check()
    await page.locator('[data-test=sweep-point]').fill('30')
    await page.locator('[data-test=sweep-point-value]').getByText('pH 10.00').waitFor()
    await page.getByRole('tab', { name: 'Totals' }).click()
    const nickel = page.locator('[data-test=component-row]', { hasText: 'dissolved Ni' })
    await expect(nickel.locator('[data-test=component-names]').textContent()).resolves.toBe('dissolved Ni · free Ni²⁺ · mg/L as Ni')
    const dissolved = expected.points[30]!.components.find((c) => c.name === 'Ni^2+')!.dissolved!
    // mol/L × 58.693 g/mol (IUPAC, Standard atomic weights 2021) × 1000 mg/g; below the limit at pH 10.
    const shown = formatScientific(dissolved * 58.693e3)
    await expect(nickel.locator('[data-test=dissolved]').textContent()).resolves.toContain(shown)
    await expect(nickel.locator('[data-test=dissolved]').getAttribute('aria-label')).resolves.toBe(`dissolved Ni: ${shown} mg/L as Ni`)
    expect(dissolved * 58.693e3).toBeLessThan(1)
    await screenshot(page, 'units-totals-mg')

    // The hand method beside the exact answer at the same point.
    await page.getByRole('tab', { name: 'Shortcut' }).click()
    const byHand = expected.points[30]!.shortcut!.components.find((c) => c.name === 'Ni^2+')!
    const row = page.locator('[data-test=shortcut-row]', { hasText: 'Ni²⁺' })
    await expect(row.locator('[data-test=shortcut-factor]').textContent()).resolves.toBe(byHand.factor.toFixed(2))
    await screenshot(page, 'units-shortcut')

    // The choice is remembered for this system.
    await page.reload()
    await page.locator('[data-test=limit-sentence]').waitFor()
    await expect(page.locator('[data-test=output-unit]').inputValue()).resolves.toBe('mg/L')

    // The diagram shades the window and draws the limit on the solubility diagram of nickel.
    await page.getByRole('tab', { name: 'Diagram' }).click()
    await page.locator('[data-test=kind-solubility]').click()
    await page.locator('[data-test=diagram-plot] svg').waitFor()
    await expect(page.locator('[data-test=diagram-limits]').textContent()).resolves.toMatch(/Shaded: where dissolved Ni ≤ 1 mg\/L\.\s*Dashed line: the limit\./)
    await expect(page.locator('[data-test=diagram-plot] svg').textContent()).resolves.toContain('dissolved Ni ≤ 1 mg/L')
    await screenshot(page, 'units-limit-diagram')

    // A click on the plot picks the nearest sweep point for the tables: near the right end, pH 13.
    const plot = page.locator('[data-test=diagram-plot] svg')
    const box = (await plot.boundingBox())!
    await plot.click({ position: { x: box.width - 50, y: box.height / 2 } })
    await expect(page.locator('[data-test=sweep-point-value]').textContent()).resolves.toMatch(/^pH 1[23]\.\d0$/)

    // The shortcut factor along the sweep: one line a component, around 0 where the hand method holds.
    await page.locator('[data-test=kind-shortcut]').click()
    await page.locator('[data-test=diagram-plot] svg').waitFor()
    await expect(page.locator('[data-test=diagram-plot] svg').textContent()).resolves.toContain('factor')
    await screenshot(page, 'units-shortcut-diagram')

    // The printable report: the window in words and every sweep point, in the units chosen for the system.
    await page.locator('[data-test=tab-report]').click()
    await page.locator('[data-test=report-link]').click()
    await page.waitForURL(/\/report\?run=\d+/)
    await expect(page.locator('[data-test=limit-sentence]').textContent()).resolves.toContain(words)
    await page.locator('[data-test=sweep-table] th', { hasText: 'dissolved Ni (mg/L as Ni)' }).waitFor()
    await expect(page.locator('[data-test=sweep-table] tbody tr').count()).resolves.toBe(expected.values.length)
    await screenshot(page, 'units-report')
  })
})
