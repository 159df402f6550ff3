// The standardisation of caustic in Chromium: the shipped phthalate example
// is run, the end point is read beside the curve (marked on it, the
// derivative below), and the whole curve exported as CSV with volume, pH,
// β and every species. Expected numbers come from the solver run here on
// the same file.
import { readFile } from 'node:fs/promises'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { signInAs } from '../setup/accounts'
import { openSignedIn, screenshot, sidewaysOverflow } from '../setup/browser'
import { compile } from '../../shared/poise/index'
import { titration } from '../../server/solver/index'
import { endPointSentences } from '../../shared/results/titration'
import type { TitrationCurveResult } from '../../shared/types/result'

await useBuiltServer()

const model = compile(readFileSync(join(__dirname, '../../examples/caustic-standardised-against-phthalate.poise'), 'utf8')).model!
const expected = titration(model) as TitrationCurveResult

describe('a titration in the workbench', () => {
  it('reads the end point of the phthalate standardisation and exports the curve as CSV', async () => {
    const editor = await signInAs('editor')
    const page = await openSignedIn('/labs/demo/systems/caustic-standardised-against-phthalate', editor.cookie)
    await page.locator('.cm-content').waitFor()
    await page.setViewportSize({ width: 1280, height: 900 })
    await page.locator('[data-test=run]').click()

    const endPoint = page.locator('[data-test=end-point]')
    await endPoint.waitFor()
    // 2.4997 mmol of phthalate against 0.1000 mol/L: 24.995 mL.
    const words = endPointSentences(expected)
    expect(words).toEqual([expect.stringMatching(/^end point 1 at 24\.99\d* mL, pH 8\.\d\d$/)])
    await expect(endPoint.textContent()).resolves.toBe(words[0])
    await expect(page.locator('[data-test=end-point-mark]').count()).resolves.toBe(1)
    await page.locator('[data-test=titration-derivative] path').waitFor()
    await screenshot(page, 'titration-curve')

    // On a phone (390 px) the curve, its point slider and the read-out beside it fit the window.
    await page.setViewportSize({ width: 390, height: 844 })
    await expect(sidewaysOverflow(page)).resolves.toBeNull()
    // …and the slider keeps a width a thumb can drag along.
    expect((await page.locator('[data-test=titration-point]').boundingBox())?.width ?? 0).toBeGreaterThan(150)
    await screenshot(page, 'titration-curve-phone')
    await page.setViewportSize({ width: 1280, height: 900 })

    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test=titration-csv]').click()])
    expect(download.suggestedFilename()).toMatch(/^caustic-standardised-against-phthalate-.*-titration\.csv$/)
    const csv = (await readFile((await download.path())!, 'utf8')).replace(/^\uFEFF/, '').trim().split('\r\n').map((row) => row.split(','))
    expect(csv).toHaveLength(expected.values.length + 1)
    expect(csv[0]!.slice(0, 5)).toEqual(['added volume (mL)', 'converged', 'pH', 'dpH/dV (per mL)', 'buffer capacity (mol/L per pH)'])
    for (const s of expected.points[0]!.species) expect(csv[0]).toContain(`${s.name} (mol/L)`)
    const half = expected.values.indexOf(12.5)
    expect(Number(csv[half + 1]![0])).toBe(12.5)
    expect(Number(csv[half + 1]![2])).toBeCloseTo(expected.points[half]!.pH, 10)
    expect(Number(csv[half + 1]![4])).toBeCloseTo(expected.points[half]!.bufferCapacity!, 10)
  })
})
