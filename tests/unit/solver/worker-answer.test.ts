// The worker's answer is the solver's Result (or sweep) as UTF-8 JSON bytes:
// decoded, it is exactly what solve() and sweep() return.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { solve, sweep } from '../../../server/solver/index'
import { encodeSweep, solveTask } from '../../../server/workers/solve.worker'
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
