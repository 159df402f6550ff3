// How a stored run goes on the queue: its kind, its points, the ranges
// several workers share, and which job a free worker takes first.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { pointRanges, rangePriority, studyShapeOf } from '../../../server/jobs/kinds'
import { SOLVE_LIMITS } from '../../../server/utils/solve-limits'

// 1 mmol/L HCl (demo values).
const rinse = `system "Rinse"
activity ideal
component H+ total 1 mmol/L
component Cl- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
`
const model = (extra = '') => {
  const out = compile(rinse.replace('component H+ total 1 mmol/L', extra ? 'component H+ pH 7' : 'component H+ total 1 mmol/L') + extra)
  expect(out.model, out.diagnostics.map((d) => d.message).join('; ')).toBeTruthy()
  return out.model!
}

describe('study kinds on the queue', () => {
  it('queues a single solve as one job of one point', () => {
    const single = model()
    expect(studyShapeOf(single).kind).toBe('single')
    expect(pointRanges(single)).toEqual([{ from: 0, to: 1 }])
  })

  it('splits a long sweep into ranges of about jobSegmentPoints that cover every point once, in order', () => {
    const long = model('sweep pH from 2 to 12 points 5000\n')
    expect(studyShapeOf(long).kind).toBe('sweep')
    const ranges = pointRanges(long)
    expect(ranges.length).toBe(Math.ceil(5000 / SOLVE_LIMITS.jobSegmentPoints))
    expect(ranges[0]!.from).toBe(0)
    expect(ranges.at(-1)!.to).toBe(5000)
    for (let k = 1; k < ranges.length; k++) expect(ranges[k]!.from).toBe(ranges[k - 1]!.to)
  })

  it('splits a map into ranges of whole rows', () => {
    const map = model('map pH from 2 to 12 points 101 by total Cl- from 1e-4 to 1e-1 mol/L points 50 log\n')
    expect(studyShapeOf(map).kind).toBe('map')
    const ranges = pointRanges(map)
    expect(ranges.length).toBeGreaterThan(1)
    for (const range of ranges) expect(range.from % 101).toBe(0)
    expect(ranges.at(-1)!.to).toBe(5050)
  })

  it('keeps a short sweep in one job', () => {
    expect(pointRanges(model('sweep pH from 2 to 12 points 101\n'))).toEqual([{ from: 0, to: 101 }])
  })

  it('gives a small job a worker before the next slice of a long one', () => {
    expect(rangePriority({ from: 0, to: 1 })).toBeLessThan(rangePriority({ from: 0, to: 101 }))
    expect(rangePriority({ from: 0, to: 101 })).toBeLessThan(rangePriority({ from: 0, to: SOLVE_LIMITS.jobSegmentPoints }))
    expect(rangePriority({ from: 0, to: 1 })).toBeGreaterThanOrEqual(1)
  })
})
