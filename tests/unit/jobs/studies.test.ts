// A study computed slice by slice, range by range (as workers do), gives the
// answer one uninterrupted computation gives; a cancelled one keeps a prefix.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { vinegarWith } from '../../fixtures/studies'
import { solveMap, sweep } from '../../../server/solver/index'
import { mapCell } from '../../../shared/results/map-columns'
import { STUDY_RUNNERS, type Slice } from '../../../server/jobs/studies'
import type { MapAnswer, SweepResult } from '../../../shared/types/result'

// Acetic acid, 10 mmol/L, swept in pH (tests/fixtures/studies.ts).
const vinegar = compile(vinegarWith('sweep pH from 2 to 12 points 300')).model!
const runner = STUDY_RUNNERS.sweep!
const options = { timeBudgetMs: 20_000 }
const everything = { progress: () => {}, shouldStop: () => false, solveOptions: options }

describe('a sweep as a job', () => {
  it('computed in three ranges equals the sweep computed at once, point for point', () => {
    const items: string[] = []
    for (const [from, to] of [[0, 100], [100, 200], [200, 300]] as const) {
      const slice: Slice = runner.run(vinegar, from, to, everything)
      expect(slice.count).toBe(to - from)
      expect(slice.failed).toBe(0)
      items.push(...slice.items)
    }
    const joined = JSON.parse(runner.finish(vinegar, items, true, options)!) as SweepResult
    const once = sweep(vinegar, options)
    expect(joined.values).toEqual(once.values)
    expect(joined.points).toHaveLength(300)
    for (const i of [0, 99, 100, 101, 199, 200, 299]) {
      expect(joined.points[i]!.pH).toBeCloseTo(once.points[i]!.pH, 9)
      joined.points[i]!.species.forEach((s, k) => expect(s.log10 ?? 0).toBeCloseTo(once.points[i]!.species[k]!.log10 ?? 0, 8))
    }
  })

  it('stops a slice when asked, and goes on from there in the next', () => {
    let asked = 0
    const first = runner.run(vinegar, 0, 300, { ...everything, shouldStop: () => ++asked >= 40 })
    expect(first.count).toBe(40)
    const rest = runner.run(vinegar, 40, 300, everything)
    expect(rest.count).toBe(260)
    const joined = JSON.parse(runner.finish(vinegar, [...first.items, ...rest.items], true, options)!) as SweepResult
    expect(joined.points.map((p) => p.converged)).toEqual(Array(300).fill(true))
  })

  it('keeps, cancelled, the points computed and their values only', () => {
    const slice = runner.run(vinegar, 0, 150, everything)
    const kept = JSON.parse(runner.finish(vinegar, slice.items, false, options)!) as SweepResult
    expect(kept.values).toEqual(vinegar.sweep!.values.slice(0, 150))
    expect(kept.points).toHaveLength(150)
    expect(runner.finish(vinegar, [], false, options)).toBeNull()
  })
})

// The same acid as a map: pH by the acetate total (demo ranges).
const vinegarMap = compile(vinegarWith('map pH from 2 to 12 points 21 by total CH3COO- from 1e-4 to 1e-1 mol/L points 12 log'))


describe('a map as a job', () => {
  it('computed in ranges of whole rows equals the map solved at once, cell for cell', () => {
    const model = vinegarMap.model!
    expect(model, vinegarMap.diagnostics.map((d) => d.message).join('; ')).toBeTruthy()
    const runner = STUDY_RUNNERS.map!
    const items: string[] = []
    for (const [from, to] of [[0, 84], [84, 168], [168, 252]] as const) {
      const slice = runner.run(model, from, to, everything)
      expect(slice.count).toBe(to - from)
      items.push(...slice.items)
    }
    const joined = JSON.parse(runner.finish(model, items, true, options)!) as MapAnswer
    const once = solveMap(model, options)
    expect(joined).toMatchObject({ format: 'map-columns', cellsDone: 252, cancelled: false, failedCells: once.failedCells })
    for (const k of [0, 20, 21, 83, 84, 85, 167, 168, 251]) {
      expect(mapCell(joined, Math.floor(k / 21), k % 21).pH).toBeCloseTo(mapCell(once, Math.floor(k / 21), k % 21).pH, 9)
    }
  })

  it('stops a slice only at the end of a row, and keeps, cancelled, the rows done', () => {
    const model = vinegarMap.model!
    const runner = STUDY_RUNNERS.map!
    const slice = runner.run(model, 0, 252, { ...everything, shouldStop: () => true })
    expect(slice.count).toBe(21)
    const kept = JSON.parse(runner.finish(model, slice.items, false, options)!) as MapAnswer
    expect(kept).toMatchObject({ cellsDone: 21, cancelled: true })
    expect(mapCell(kept, 1, 0).converged).toBe(false)
  })
})
