// A map in Chromium: the shipped copper example is opened (solved on
// opening as a preview), its predominance map read — the regions the solver
// finds for copper, each labelled in the plot — a cell read out on hover
// and chosen with a click (the tables show it), the colour map drawn with
// the hydroxide's SI = 0 line, and the grid CSV read back. Looked at on a
// desktop and on a phone. Expected numbers come from the solver run here.
import { readFile } from 'node:fs/promises'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { signInAs } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'
import { compile } from '../../shared/poise/index'
import { solveMap } from '../../server/solver/index'
import { predominance } from '../../shared/results/map'
import { typesetFormula } from '../../shared/results/typeset'

await useBuiltServer()

const model = compile(readFileSync(join(__dirname, '../../examples/copper-hydroxide-carbonate-map.poise'), 'utf8')).model!
const expected = predominance(solveMap(model), model, 'Cu^2+')

describe('a map in the workbench', () => {
  it('reads the predominance map of copper, a cell, the colour map and the grid CSV', async () => {
    const editor = await signInAs('editor')
    const page = await openSignedIn('/labs/demo/systems/copper-hydroxide-carbonate-map', editor.cookie)
    await page.locator('.cm-content').waitFor()
    await page.setViewportSize({ width: 1280, height: 900 })
    const plot = page.locator('[data-test=map-plot] svg')
    await plot.first().waitFor()

    // Every region the solver finds is listed and labelled inside the plot.
    const names = expected.regions.map((r) => typesetFormula(expected.candidates[r.candidate]!.name))
    expect(names).toEqual(expect.arrayContaining(['Cu²⁺', 'Cu(OH)₂(s)', 'CuCO₃']))
    const listed = (await page.locator('[aria-label=Regions] li').allTextContents()).map((t) => t.replace(/\s*\(\d+ cells\)\s*$/, '').trim())
    expect(listed).toEqual(names)
    const labels = await page.locator('[data-test=map-plot] g[aria-label=text] text').allTextContents()
    const big = expected.regions.filter((r) => r.cells >= 3).map((r) => typesetFormula(expected.candidates[r.candidate]!.name))
    expect(big).toEqual(expect.arrayContaining(['Cu²⁺', 'Cu(OH)₂(s)', 'CuCO₃']))
    expect(labels.filter((l) => !l.startsWith('SI = 0')).sort()).toEqual([...big].sort())
    await screenshot(page, 'map-predominance-1280')

    // Hover over the top right corner of the grid (pH 12, 0.01 mol/L of copper): the hydroxide holds nearly all of it.
    const box = (await plot.last().boundingBox())!
    const frame = (await page.locator('[data-test=map-plot] rect[aria-label=frame]').boundingBox())!
    expect(frame.width).toBeGreaterThan(box.width / 2)
    await page.mouse.move(frame.x + frame.width - 3, frame.y + 3)
    const readout = page.locator('[data-test=map-readout]')
    await expect.poll(() => readout.textContent()).toMatch(/^pH 12\.00, Total Cu²⁺ 1\.00e-2 mol\/L: Cu\(OH\)₂\(s\) holds most Cu²⁺/)
    // A click there shows that cell in the tables.
    await page.mouse.click(frame.x + frame.width - 3, frame.y + 3)
    await expect.poll(() => page.locator('[data-test=summary-ph]').textContent()).toMatch(/12\.00/)

    // The colour map of dissolved copper with the hydroxide's boundary over it.
    await page.locator('[data-test=map-kind-colour]').click()
    await page.locator('[data-test=map-quantity]').selectOption('dissolved:Cu^2+')
    await page.locator('[data-test=map-plot] figure').waitFor()
    await expect(page.locator('[data-test=map-plot]').textContent()).resolves.toContain('SI = 0 Cu(OH)₂(s)')
    await screenshot(page, 'map-colour-1280')

    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test=map-export-csv]').click()])
    expect(download.suggestedFilename()).toMatch(/^copper-hydroxide-carbonate-map-.*-grid\.csv$/)
    const csv = (await readFile((await download.path())!, 'utf8')).trim().split('\r\n').map((row) => row.split(','))
    expect(csv).toHaveLength(model.map!.x.values.length * model.map!.y.values.length + 1)
    expect(csv[0]!.slice(0, 3)).toEqual(['total Cu^2+ (mol/L)', 'pH', 'converged'])

    // On a phone the map fits the width and still reads out.
    await page.setViewportSize({ width: 390, height: 844 })
    await page.locator('[data-test=map-kind-predominance]').click()
    await page.locator('[data-test=map-plot] svg').first().scrollIntoViewIfNeeded()
    const narrow = (await page.locator('[data-test=map-plot] svg').last().boundingBox())!
    expect(narrow.width).toBeLessThanOrEqual(390)
    await expect(page.evaluate(() => document.documentElement.scrollWidth)).resolves.toBeLessThanOrEqual(390)
    await screenshot(page, 'map-predominance-390')
  })
})
