// Reading a map answer for the workbench: the predominance of a component
// (shares of its total, dissolved and precipitated), the colour map's
// quantity, the solids' SI = 0 lines and the grid CSV, checked against the
// cells themselves.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { solveMap } from '../../../server/solver/index'
import { mapCell } from '../../../shared/results/map-columns'
import { SATURATED_SI, positionExtent, boundaryAnchor, mapCsv, nearestIndex, predominance, predominanceComponents, quantityGrid, solidBoundaries } from '../../../shared/results/map'
import { unitScale } from '../../../shared/results/units'

const source = readFileSync(resolve(import.meta.dirname, '../../../examples/copper-hydroxide-carbonate-map.poise'), 'utf8')
  .replace(/^map .*$/m, 'map pH from 3 to 12 points 10 by total Cu^2+ from 1e-6 to 1e-2 mol/L points 5 log')
const model = compile(source).model!
const map = solveMap(model)
const nx = 10

describe('predominance', () => {
  const p = predominance(map, model, 'Cu^2+')
  it('offers the components every holder holds non-negatively (not H+)', () => {
    expect(predominanceComponents(model)).toEqual(['Cu^2+', 'CO3^2-', 'Na+', 'Cl-'])
  })
  it('names in each cell the species or solid with the largest share of the total, dissolved and precipitated', () => {
    for (const k of [0, 9, 25, 49]) {
      const cell = mapCell(map, Math.floor(k / nx), k % nx)
      const holdings = [
        ...model.species.filter((s) => s.nu[1]! > 0).map((s) => [s.name, s.nu[1]! * cell.species.find((x) => x.name === s.name)!.concentration] as const),
        ...model.solids.filter((s) => s.nu[1]! > 0).map((s) => [s.name, s.nu[1]! * cell.solids.find((x) => x.name === s.name)!.amount] as const),
      ]
      const best = holdings.reduce((a, b) => (b[1] > a[1] ? b : a))
      const total = holdings.reduce((sum, h) => sum + h[1], 0)
      expect(p.candidates[p.dominant[k]!]!.name).toBe(best[0])
      expect(p.leadShare[k]).toBeCloseTo(best[1] / total, 12)
      expect(p.margin[p.dominant[k]!]![k]).toBeGreaterThanOrEqual(0)
    }
    // Free Cu²⁺ at pH 3 and the hydroxide solid at pH 12 with the most copper.
    expect(p.candidates[p.dominant[0]!]!.name).toBe('Cu^2+')
    expect(p.candidates[p.dominant[49]!]!.name).toBe('Cu(OH)2(s)')
  })
  it('lists each region with a label cell inside it', () => {
    expect(p.regions.reduce((n, r) => n + r.cells, 0)).toBe(50)
    for (const r of p.regions) expect(p.dominant[r.cell]).toBe(r.candidate)
  })
})

describe('colour map, boundaries and CSV', () => {
  it('gives the log of a dissolved total in the chosen unit, and NaN for nothing', () => {
    const molar = quantityGrid(map, 'dissolved:Cu^2+')
    const cell = mapCell(map, 2, 4)
    expect(molar[2 * nx + 4]).toBeCloseTo(Math.log10(cell.components.find((c) => c.name === 'Cu^2+')!.dissolved!), 12)
    // Cu 63.546 g/mol (IUPAC 2021): mg/L is mol/L × 63546.
    const mg = quantityGrid(map, 'dissolved:Cu^2+', unitScale(model, { unit: 'mg/L', asElement: false }))
    expect(mg[2 * nx + 4]! - molar[2 * nx + 4]!).toBeCloseTo(Math.log10(63546), 3)
    expect(quantityGrid(map, 'si:Cu(OH)2(s)')[2 * nx + 4]).toBe(cell.solids.find((s) => s.name === 'Cu(OH)2(s)')!.saturationIndex)
  })
  it('draws the SI = 0 line of a solid that appears on the grid, labelled on it', () => {
    const lines = solidBoundaries(map, model)
    expect(lines.map((l) => l.name)).toEqual(['Cu(OH)2(s)'])
    const at = boundaryAnchor(lines[0]!.si, nx)
    expect(lines[0]!.si[at]).toBeGreaterThanOrEqual(SATURATED_SI)
    expect(at).toBeGreaterThanOrEqual(0)
  })
  it('finds the cell nearest a position, log10 on a log axis; the grid reaches half a step past its ends', () => {
    expect(nearestIndex(map.y, Math.log10(2e-4))).toBe(2)
    expect(nearestIndex(map.y, Math.log10(6e-4))).toBe(3)
    expect(nearestIndex(map.x, 7.4)).toBe(4)
    const [a, b] = positionExtent(map.y)
    expect(a).toBeCloseTo(-6.5, 12)
    expect(b).toBeCloseTo(-1.5, 12)
    expect(positionExtent(map.x)).toEqual([2.5, 12.5])
  })
  it('writes one CSV line a cell with both axes, the dominant holder and the numbers at full precision', () => {
    const lines = mapCsv(map, model, { component: 'Cu^2+' }).trimEnd().split('\r\n')
    expect(lines).toHaveLength(51)
    const head = lines[0]!.split(',')
    expect(head.slice(0, 5)).toEqual(['total Cu^2+ (mol/L)', 'pH', 'converged', 'pH', 'ionic strength (mol/L)'])
    expect(head.at(-2)).toBe('dominant Cu^2+')
    const last = lines[50]!.split(',')
    expect(last.slice(0, 3)).toEqual(['0.01', '12', 'yes'])
    expect(last.at(-2)).toBe('Cu(OH)2(s)')
    expect(Number(last[4])).toBe(mapCell(map, 4, 9).ionicStrength)
  })
})
