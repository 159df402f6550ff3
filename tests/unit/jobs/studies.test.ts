// A study computed slice by slice, range by range (as workers do), gives the
// answer one uninterrupted computation gives; a cancelled one keeps a prefix.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { vinegarWith } from '../../fixtures/studies'
import { solveMap, sweep } from '../../../server/solver/index'
import { mapCell } from '../../../shared/results/map-columns'
import { STUDY_RUNNERS, type Slice, type StoredPart } from '../../../server/jobs/studies'
import { partOfBody, sliceBody } from '../../../server/jobs/store'
import { ColumnsBuilder, joinColumns, pointTexts, toSweepColumns, type PointParts } from '../../../shared/results/sweep-columns'
import type { MapAnswer, Result, SweepResult } from '../../../shared/types/result'
import { studyShapeOf } from '../../../server/jobs/kinds'

/** A slice as a worker stores it and reads it back (run_parts.body). */
const stored = (slice: Slice): StoredPart => partOfBody(sliceBody(slice), slice.count)

/** Columns as bytes: equal bytes are equal numbers bit for bit (NaN's and −0's too). */
const bytesOf = (parts: PointParts) => ({
  templates: JSON.stringify(parts.templates),
  templateOf: Array.from(parts.templateOf),
  rowOf: Array.from(parts.rowOf),
  rows: parts.rows,
  columns: parts.columns.map((c) => Buffer.from(c.buffer, c.byteOffset, c.byteLength).toString('hex')),
})

// Acetic acid, 10 mmol/L, swept in pH (tests/fixtures/studies.ts).
const vinegar = compile(vinegarWith('sweep pH from 2 to 12 points 300')).model!
const runner = STUDY_RUNNERS.sweep!
const options = { timeBudgetMs: 20_000 }
const everything = { progress: () => {}, shouldStop: () => false, solveOptions: options }

describe('a sweep as a job', () => {
  it('computed in three ranges equals the sweep computed at once, point for point', () => {
    const items: StoredPart[] = []
    for (const [from, to] of [[0, 100], [100, 200], [200, 300]] as const) {
      const slice: Slice = runner.run(vinegar, from, to, everything)
      expect(slice.count).toBe(to - from)
      expect(slice.failed).toBe(0)
      items.push(stored(slice))
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
    const joined = JSON.parse(runner.finish(vinegar, [stored(first), stored(rest)], true, options)!) as SweepResult
    expect(joined.points.map((p) => p.converged)).toEqual(Array(300).fill(true))
  })

  it('keeps, cancelled, the points computed and their values only', () => {
    const slice = runner.run(vinegar, 0, 150, everything)
    const kept = JSON.parse(runner.finish(vinegar, [stored(slice)], false, options)!) as SweepResult
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
    const items: StoredPart[] = []
    for (const [from, to] of [[0, 84], [84, 168], [168, 252]] as const) {
      const slice = runner.run(model, from, to, everything)
      expect(slice.count).toBe(to - from)
      items.push(stored(slice))
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
    const kept = JSON.parse(runner.finish(model, [stored(slice)], false, options)!) as MapAnswer
    expect(kept).toMatchObject({ cellsDone: 21, cancelled: true })
    expect(mapCell(kept, 1, 0).converged).toBe(false)
  })
})

describe('slices stored as columns', () => {
  it('join to the answer of one computation, bit for bit: a sweep in one range', () => {
    const slice = runner.run(vinegar, 0, 300, everything)
    expect(runner.finish(vinegar, [stored(slice)], true, options)).toBe(JSON.stringify(sweep(vinegar, options)))
  })

  it('join to the answer of one computation, bit for bit: a map in one range', () => {
    const model = vinegarMap.model!
    const slice = STUDY_RUNNERS.map!.run(model, 0, 252, everything)
    const joined = JSON.parse(STUDY_RUNNERS.map!.finish(model, [stored(slice)], true, options)!) as MapAnswer
    const once = solveMap(model, options)
    expect(joined.failedCells).toBe(once.failedCells)
    expect(joined.cells).toEqual(JSON.parse(JSON.stringify(once.cells, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v))))
    expect(bytesOf(joinColumns([{ columns: (stored(slice) as { columns: PointParts }).columns, from: 0, to: 252 }]))).toEqual(bytesOf(once.cells as PointParts))
  })

  it('cut anywhere and joined give the columns of all the points added at once, bit for bit', () => {
    // Points of several shapes (converged, not, one with an extra key), NaN, −0 and infinities among the numbers.
    const good = sweep(vinegar, options).points.slice(0, 40)
    const points: Result[] = good.map((p, i) => {
      if (i % 7 === 3) return { ...p, converged: false, pH: Number.NaN }
      if (i % 11 === 5) return { ...p, ionicStrength: -0, note: 'odd' } as Result
      if (i === 17) return { ...p, pH: Number.POSITIVE_INFINITY }
      return p
    })
    const once = new ColumnsBuilder()
    for (const p of points) once.add(p)
    const whole = once.build()
    const cuts = [0, 1, 9, 10, 23, 31, 40]
    const pieces = cuts.slice(1).map((to, k) => {
      const b = new ColumnsBuilder()
      for (const p of points.slice(cuts[k], to)) b.add(p)
      return { columns: (stored({ count: to - cuts[k]!, columns: b.build(), failed: 0 }) as { columns: PointParts }).columns, from: 0, to: to - cuts[k]! }
    })
    expect(bytesOf(joinColumns(pieces))).toEqual(bytesOf(whole))
    // A range cut from the middle of longer columns is what those points alone give.
    const middle = new ColumnsBuilder()
    for (const p of points.slice(12, 29)) middle.add(p)
    expect(bytesOf(joinColumns([{ columns: whole, from: 12, to: 29 }]))).toEqual(bytesOf(middle.build()))
    // Each point's text is its own JSON, character for character.
    expect(pointTexts(joinColumns(pieces))).toEqual(points.map((p) => JSON.stringify(p)))
  })

  it('refuses a range outside the columns, saying so', () => {
    const columns = toSweepColumns(sweep(vinegar, options))
    expect(() => joinColumns([{ columns, from: 290, to: 301 }])).toThrow(/points 290 to 301 asked of columns of 300 points/)
  })
})

describe('a Monte Carlo run as a job', () => {
  const mc = STUDY_RUNNERS['monte-carlo']!
  // Acetic acid with a ± of our own on its pKa (tests/fixtures/studies.ts), 120 draws of an 11-point sweep.
  const drawn = compile(vinegarWith('sweep pH from 3 to 8 points 11\nuncertainty draws 120 seed 5').replace('pKa 4.76', 'pKa 4.76 ± 0.05')).model!
  const acidBand = (point: Result) => point.species.find((s) => s.name === 'CH3COOH')!.log10Uncertainty!

  it('is the kind of a sweep that draws, storing a sweep, its progress counted in draws', () => {
    const shape = studyShapeOf(drawn)
    expect(shape.kind).toBe('monte-carlo')
    expect(shape.points(drawn)).toBe(120)
    expect(shape.answerKind?.(drawn)).toBe('sweep')
    expect(shape.unit).toBe('draws')
    // Without a ± there is nothing to draw: an ordinary sweep.
    expect(studyShapeOf(compile(vinegarWith('sweep pH from 3 to 8 points 11\nuncertainty draws 120 seed 5')).model!).kind).toBe('sweep')
  })

  it('drawn in three slices, stored and read back, gives the bands the sweep gives when it draws at once', () => {
    const parts: StoredPart[] = []
    let reported = 0
    for (const [from, to] of [[0, 50], [50, 51], [51, 120]] as const) {
      const slice = mc.run(drawn, from, to, { ...everything, progress: (n) => { reported = n } })
      expect(slice.count).toBe(to - from)
      expect(reported).toBe(to - from)
      parts.push(stored(slice))
    }
    const joined = JSON.parse(mc.finish(drawn, parts, true, options)!) as SweepResult
    const once = sweep(drawn, options)
    expect(joined.points).toHaveLength(11)
    expect(mc.failedOf!(drawn, JSON.stringify(joined))).toBe(0)
    for (const i of [0, 5, 10]) {
      expect(joined.points[i]!.uncertainty).toMatchObject({ method: 'monte-carlo', samples: 120, seed: 5, failed: 0 })
      expect(joined.points[i]!.pH).toBeCloseTo(once.points[i]!.pH, 12)
      expect(acidBand(joined.points[i]!)).toEqual(acidBand(once.points[i]!))
      expect(joined.points[i]!.pHUncertainty).toEqual(once.points[i]!.pHUncertainty)
    }
  })

  it('stops between draws when asked; cancelled, the bands rest on the draws made and say so', () => {
    let asked = 0
    const slice = mc.run(drawn, 0, 120, { ...everything, shouldStop: () => ++asked >= 30 })
    expect(slice.count).toBe(30)
    const kept = JSON.parse(mc.finish(drawn, [stored(slice)], false, options)!) as SweepResult
    expect(kept.points).toHaveLength(11)
    expect(kept.points[4]!.uncertainty).toMatchObject({ samples: 30, note: '30 of 120 draws were made before the run was cancelled: the bands rest on fewer draws than asked.' })
    expect(mc.finish(drawn, [], false, options)).toBeNull()
  })
})
