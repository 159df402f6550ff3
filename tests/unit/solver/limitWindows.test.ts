/**
 * Limit windows: the ends of each range are located by exact solves, so the
 * capped quantity solved afresh at an end equals the limit (within what a
 * bracket of 1e-4 pH allows), keeps it on the inside and breaks it just
 * outside. Checked against the solver itself at the ends, not against the
 * grid. The system is the shipped nickel rinse (constants from memory).
 */
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { solveAtSweepValue, sweep } from '../../../server/solver/index'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'
import { limitQuantity, limitSentence } from '../../../shared/results/limits'

const text = readFileSync(join(__dirname, '../../../examples/nickel-rinse-discharge.poise'), 'utf8')

function modelOf(source: string): Model {
  const compiled = compile(source)
  expect(compiled.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
  return compiled.model!
}

/** Dissolved Ni in mg/L as Ni at pH v, from a fresh solve (58.693 g/mol, IUPAC Standard atomic weights 2021). */
function nickelAt(model: Model, v: number): number {
  return limitQuantity(model.components, model.limits![0]!, solveAtSweepValue(model, v)) * 58.693e3
}

describe('limit windows along a pH sweep', () => {
  const model = modelOf(text)
  const answer = sweep(model)

  it('gives one window for the 1 mg/L limit, in the JSON shape', () => {
    expect(answer.limits).toEqual([{ quantity: 'dissolved Ni', value: 1, unit: 'mg/L', ranges: [[expect.any(Number), expect.any(Number)]] }])
    const [[from, to]] = answer.limits![0]!.ranges
    // Between the grid points where the grid changes side (pH 9.6 above 1 mg/L, 9.7 below; 12.3 below, 12.4 above).
    expect(from).toBeGreaterThan(9.6)
    expect(from).toBeLessThan(9.7)
    expect(to).toBeGreaterThan(12.3)
    expect(to).toBeLessThan(12.4)
  })

  it('puts each end where a fresh solve gives the limit, to 0.001 pH', () => {
    const [[from, to]] = answer.limits![0]!.ranges
    for (const end of [from, to]) {
      const q = nickelAt(model, end)
      expect(q).toBeLessThanOrEqual(1)
      expect(q).toBeGreaterThan(0.995)
    }
    expect(nickelAt(model, from - 0.001)).toBeGreaterThan(1)
    expect(nickelAt(model, to + 0.001)).toBeGreaterThan(1)
    // Not read off the grid: neither end is a grid value.
    expect(model.sweep!.values.some((v) => Math.abs(v - from) < 1e-9 || Math.abs(v - to) < 1e-9)).toBe(false)
  })

  it('says the window in words', () => {
    const [[from, to]] = answer.limits![0]!.ranges
    expect(limitSentence(answer, answer.limits![0]!)).toBe(`dissolved Ni ≤ 1 mg/L from pH ${from.toFixed(2)} to ${to.toFixed(2)}`)
  })

  it('starts a range at the sweep\'s first value when the limit already holds there, and says when it holds nowhere', () => {
    const from10 = modelOf(text.replace('sweep pH from 7 to 13 step 0.1', 'sweep pH from 10 to 13 step 0.1').replace('limit dissolved Ni 1 mg/L', 'limit dissolved Ni 1 mg/L\nlimit dissolved Ni^2+ 1 µg/L'))
    const windows = sweep(from10).limits!
    expect(windows[0]!.ranges[0]![0]).toBe(10)
    expect(windows[0]!.ranges[0]![1]).toBeCloseTo(answer.limits![0]!.ranges[0]![1], 3)
    // Nickel never falls to 1 µg/L here (its lowest is about 33 µg/L near pH 10.75).
    expect(windows[1]).toEqual({ quantity: 'dissolved Ni', value: 1, unit: 'µg/L', ranges: [] })
    expect(limitSentence(sweep(from10), windows[1]!)).toBe('dissolved Ni stays above 1 µg/L over the whole sweep (pH 10.00 to 13.00)')
  })
})
