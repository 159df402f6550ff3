// The worker's answer is the solver's Result (or sweep) as UTF-8 JSON bytes:
// decoded, it is exactly what solve() and sweep() return.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { solve, solveMap, sweep } from '../../../server/solver/index'
import { mapCell } from '../../../shared/results/map-columns'
import { readdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { encodeSweep, solveSweepToBytes, solveTask } from '../../../server/workers/solve.worker'
import { benchSystemSource } from '../../../bench/systems'

const decode = (bytes: Uint8Array) => JSON.parse(new TextDecoder().decode(bytes))
/** Elapsed times differ between two runs; everything else must not. */
const withoutTimes = (value: unknown) => JSON.parse(JSON.stringify(value, (k, v) => (/elapsed|timing/i.test(k) ? undefined : v)))

describe('solveTask', () => {
  it('answers a single solve with the bytes of its Result', () => {
    const model = compile(benchSystemSource(null)).model!
    const answer = solveTask({ model, timeBudgetMs: 10_000 })
    expect(answer.kind).toBe('single')
    expect(answer.failedPoints).toBe(0)
    expect(withoutTimes(decode(answer.resultBytes))).toEqual(withoutTimes(solve(model)))
  })

  it('answers a map with the bytes of its MapAnswer: cells by columns, each cell the Result solveMap made', () => {
    const model = compile(benchSystemSource('map pH from 4 to 12 points 9 by temperature from 15 C to 35 C points 3')).model!
    const answer = solveTask({ model, timeBudgetMs: 10_000 })
    expect(answer.kind).toBe('map')
    const decoded = decode(answer.resultBytes)
    expect(decoded).toMatchObject({ format: 'map-columns', cellsDone: 27, cancelled: false, failedCells: answer.failedPoints })
    expect(Array.isArray(decoded.cells.columns[0])).toBe(true)
    const direct = solveMap(model)
    for (const [i, j] of [[0, 0], [1, 4], [2, 8]]) expect(withoutTimes(mapCell(decoded, i, j))).toEqual(withoutTimes(mapCell(direct, i, j)))
  })

  it('answers a sweep with the bytes of its SweepResult, in a buffer of its own (safe to transfer)', () => {
    const model = compile(benchSystemSource('sweep pH from 4 to 12 points 30')).model!
    const answer = solveTask({ model, timeBudgetMs: 10_000 })
    expect(answer.kind).toBe('sweep')
    expect(answer.resultBytes.byteOffset).toBe(0)
    // Not a Node Buffer: those may share one pooled ArrayBuffer, which must never be transferred.
    expect(Buffer.isBuffer(answer.resultBytes)).toBe(false)
    const decoded = decode(answer.resultBytes)
    expect(decoded.points).toHaveLength(30)
    expect(withoutTimes(decoded)).toEqual(withoutTimes(sweep(model)))
  })

  it('writes a sweep point by point to the very bytes JSON.stringify gives, growing its buffer as needed', () => {
    const model = compile(benchSystemSource('sweep pH from 4 to 12 points 40')).model!
    const answer = sweep(model)
    answer.limits = [{ quantity: 'dissolved Cu', value: 1, unit: 'mg/L', ranges: [[4, 6.5]], note: 'Cu²⁺ — a non-ASCII note' }]
    answer.points[3].reason = 'ä'.repeat(20_000)
    const expected = JSON.stringify(answer)
    const bytes = encodeSweep(answer)
    expect(new TextDecoder().decode(bytes)).toBe(expected)
    // The sweep was consumed: its points were let go as they were written.
    expect(answer.points.every(p => p === undefined)).toBe(true)
  })
})

describe('solveSweepToBytes', () => {
  const examplesDir = resolve(import.meta.dirname, '../../../examples')
  const withSweep = readdirSync(examplesDir).filter(f => f.endsWith('.poise'))
    .map(f => [f, readFileSync(resolve(examplesDir, f), 'utf8')] as [string, string])
    .filter(([, source]) => /^sweep /m.test(source))

  it.each(withSweep)('writes %s point by point to the bytes of JSON.stringify(sweep(model))', (_name, source) => {
    const model = compile(source).model!
    const { bytes, failedPoints } = solveSweepToBytes(model, { timeBudgetMs: 20_000 })
    const expected = sweep(model)
    expect(withoutTimes(decode(bytes))).toEqual(withoutTimes(expected))
    expect(new TextDecoder().decode(bytes)).toBe(JSON.stringify(expected))
    expect(failedPoints).toBe(expected.points.filter(p => !p.converged).length)
  })

  it('keeps the limit windows, located from the points it let go', () => {
    const source = benchSystemSource('sweep pH from 4 to 12 points 60') + 'limit dissolved Cu 1 mg/L\nlimit dissolved Zn 0.5 mg/L\n'
    const model = compile(source).model!
    expect(model.limits).toHaveLength(2)
    const { bytes } = solveSweepToBytes(model, { timeBudgetMs: 20_000 })
    const expected = sweep(model)
    expect(expected.limits![0].ranges.length).toBeGreaterThan(0)
    expect(new TextDecoder().decode(bytes)).toBe(JSON.stringify(expected))
  })

  it('writes a sweep that cannot run at all from its whole answer', () => {
    const model = compile(benchSystemSource('sweep pH from 4 to 12 points 5')).model!
    const broken = { ...model, components: model.components.map((c, j) => (j === 1 ? { ...c, value: Number.NaN } : c)) }
    const { bytes, failedPoints } = solveSweepToBytes(broken, { timeBudgetMs: 20_000 })
    const expected = sweep(broken)
    expect(failedPoints).toBe(expected.points.filter(p => !p.converged).length)
    expect(failedPoints).toBeGreaterThan(0)
    expect(new TextDecoder().decode(bytes)).toBe(JSON.stringify(expected))
  })
})
