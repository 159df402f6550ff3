// A map is its cells: each cell equals an independent solve of the model at
// that cell's two values, and a row equals the sweep along x at that row's
// y value. Cancelling keeps the cells done; failures are marked and the map
// goes on. The chemistry is the shipped copper example (constants from
// memory); these tests compare the solver with itself, not with the world.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'
import type { Result } from '../../../shared/types/result'
import { solve, solveMap, sweep } from '../../../server/solver/index'
import { CANCELLED_CELL_REASON } from '../../../server/solver/map'
import { mapAnswerJson, mapCell, mapQuantity, toMapResult } from '../../../shared/results/map-columns'

const source = readFileSync(new URL('../../../examples/copper-hydroxide-carbonate-map.poise', import.meta.url), 'utf8')
  .replace(/^map .*$/m, 'map pH from 4 to 11 points 15 by total Cu^2+ from 1e-5 to 1e-2 mol/L points 7 log')
const model = compile(source).model!

/** The model with one component set as a map axis would set it. */
function at(m: Model, axis: { variable: string; component: string | null }, v: number): Model {
  const out = structuredClone(m)
  delete out.map
  if (axis.variable === 'pH') {
    const h = out.components.find((c) => c.name === 'H+')!
    h.mode = 'pH'
    h.value = v
  } else {
    out.components.find((c) => c.name === axis.component)!.value = v
  }
  return out
}

/** log10 of every species and the SI of every solid, the pH and which solids are present. */
function essence(r: Result) {
  return {
    pH: r.pH,
    logs: r.species.map((s) => [s.name, s.log10]),
    solids: r.solids.map((s) => [s.name, s.present, s.saturationIndex]),
  }
}

function expectClose(a: Result, b: Result) {
  expect(a.converged && b.converged).toBe(true)
  const ea = essence(a)
  const eb = essence(b)
  expect(ea.pH).toBeCloseTo(eb.pH, 8)
  expect(ea.logs.map((x) => x[0])).toEqual(eb.logs.map((x) => x[0]))
  ea.logs.forEach(([, v], k) => expect(v as number).toBeCloseTo(eb.logs[k]![1] as number, 7))
  expect(ea.solids.map((s) => s.slice(0, 2))).toEqual(eb.solids.map((s) => s.slice(0, 2)))
}

describe('a map', () => {
  const answer = solveMap(model)
  const nx = model.map!.x.values.length
  const ny = model.map!.y.values.length

  it('solves every cell, rows by y, and says so', () => {
    expect(answer).toMatchObject({ format: 'map-columns', cellsDone: nx * ny, failedCells: 0, cancelled: false })
    expect(answer.x).toEqual({ variable: 'pH', component: null, values: model.map!.x.values, log: false })
    expect(answer.y).toMatchObject({ variable: 'total', component: 'Cu^2+', log: true })
    expect(answer.cells.templateOf).toHaveLength(nx * ny)
    // Some cells hold a solid and some do not: the grid crosses a boundary.
    const present = new Set(Array.from({ length: nx * ny }, (_, k) => mapCell(answer, Math.floor(k / nx), k % nx).solids.some((s) => s.present)))
    expect(present).toEqual(new Set([true, false]))
  })

  it('has cells equal to independent solves at the same two values', () => {
    for (const [i, j] of [[0, 0], [3, 7], [6, 14], [2, 10], [5, 3]] as const) {
      const alone = solve(at(at(model, model.map!.y, model.map!.y.values[i]!), model.map!.x, model.map!.x.values[j]!))
      expectClose(mapCell(answer, i, j), alone)
    }
  })

  it('has rows equal to the sweep along x at that y', () => {
    for (const i of [0, 4, 6]) {
      const m = at(model, model.map!.y, model.map!.y.values[i]!)
      m.sweep = { ...model.map!.x }
      const row = sweep(m)
      expect(row.points).toHaveLength(nx)
      row.points.forEach((p, j) => expectClose(mapCell(answer, i, j), p))
    }
  })

  it('reads one quantity over the grid row after row, and writes the contract shape', () => {
    const pH = mapQuantity(answer, ['pH'])
    expect(pH).toHaveLength(nx * ny)
    expect(pH[2 * nx + 5]).toBe(mapCell(answer, 2, 5).pH)
    const copper = mapQuantity(answer, ['species', 'Cu^2+', 'log10'])
    expect(copper[4 * nx + 1]).toBe(mapCell(answer, 4, 1).species.find((s) => s.name === 'Cu^2+')!.log10)
    const full = toMapResult(answer)
    expect(Object.keys(full)).toEqual(['x', 'y', 'points'])
    expect(full.points).toHaveLength(ny)
    expect(full.points.every((row) => row.length === nx)).toBe(true)
    expect(full.points[3]![7]).toEqual(mapCell(answer, 3, 7))
    // Through JSON (as the API sends it) the cells are the same.
    const back = JSON.parse(mapAnswerJson(answer))
    expect(mapCell(back, 3, 7)).toEqual(JSON.parse(JSON.stringify(mapCell(answer, 3, 7))))
  })

  it('costs about what its cells cost as sweep points (Newton iterations)', () => {
    let mapIterations = 0
    for (let i = 0; i < ny; i++) for (let j = 0; j < nx; j++) mapIterations += mapCell(answer, i, j).iterations
    let sweepIterations = 0
    for (const v of model.map!.y.values) {
      const m = at(model, model.map!.y, v)
      m.sweep = { ...model.map!.x }
      sweepIterations += sweep(m).points.reduce((n, p) => n + p.iterations, 0)
    }
    expect(mapIterations).toBeLessThanOrEqual(sweepIterations * 1.25)
  })
})

describe('running a map', () => {
  it('reports monotone progress up to every cell', () => {
    const seen: number[] = []
    solveMap(model, { onProgress: (done, total) => { expect(total).toBe(105); seen.push(done) }, progressEveryMs: 0 })
    expect(seen.at(-1)).toBe(105)
    expect(seen.every((d, k) => k === 0 || d >= seen[k - 1]!)).toBe(true)
    expect(seen.length).toBeGreaterThan(7)
  })

  it('stops when cancelled, keeping the cells done and marking the rest', () => {
    let asked = 0
    const answer = solveMap(model, { cancelled: () => ++asked > 20 })
    expect(answer).toMatchObject({ cancelled: true, cellsDone: 20 })
    expect(answer.failedCells).toBe(105 - 20)
    expect(mapCell(answer, 1, 4).converged).toBe(true)
    expect(mapCell(answer, 1, 5)).toMatchObject({ converged: false, reason: CANCELLED_CELL_REASON })
    expect(mapCell(answer, 6, 14).reason).toBe(CANCELLED_CELL_REASON)
  })

  it('marks a cell that does not converge with its reason and goes on', () => {
    const answer = solveMap(model, { maxIterations: 1 })
    expect(answer.cellsDone).toBe(105)
    expect(answer.failedCells).toBeGreaterThan(0)
    const failed = Array.from({ length: 105 }, (_, k) => mapCell(answer, Math.floor(k / 15), k % 15)).filter((c) => !c.converged)
    expect(failed.length).toBe(answer.failedCells)
    for (const c of failed) expect(c.reason).toMatch(/\w/)
  })

  it('solves a slice of rows as a map of its own, telling each cell\'s index over the whole grid', () => {
    const whole = solveMap(model)
    const seen: number[] = []
    const slice = solveMap(model, { rows: { from: 2, to: 4 }, onCell: (k) => seen.push(k) })
    expect(slice.y.values).toEqual(model.map!.y.values.slice(2, 4))
    expect(slice.cellsDone).toBe(30)
    expect(seen).toEqual(Array.from({ length: 30 }, (_, k) => 30 + k))
    for (const [i, j] of [[0, 0], [1, 9], [1, 14]] as const) expectClose(mapCell(slice, i, j), mapCell(whole, i + 2, j))
  })

  it('answers a model without a map with an empty grid, not an exception', () => {
    const { map: _map, ...plain } = model
    expect(solveMap(plain as Model)).toMatchObject({ cellsDone: 0, failedCells: 0, cancelled: false })
  })
})
