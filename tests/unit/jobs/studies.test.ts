// A study computed slice by slice, range by range (as workers do), gives the
// answer one uninterrupted computation gives; a cancelled one keeps a prefix.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { sweep } from '../../../server/solver/index'
import { STUDY_RUNNERS, type Slice } from '../../../server/jobs/studies'
import type { SweepResult } from '../../../shared/types/result'

// Acetic acid, 10 mmol/L, swept in pH (pKa 4.76, handbook value from memory).
const vinegar = compile(`system "Vinegar"
activity davies
component H+ pH 4
component CH3COO- total 10 mmol/L
component Na+ total 10 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 cite "acetic acid (from memory)"
sweep pH from 2 to 12 points 300
`).model!
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
