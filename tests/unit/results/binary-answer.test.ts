// The binary form of an answer (shared/results/binary-answer.ts) and the
// worker's sweep by columns: what a client decodes equals, number for number,
// the points the solver makes for stored runs and the command line.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { binaryAnswerChunks, binaryParts, decodeBinaryAnswer, encodeBinaryAnswer, isBinaryAnswer, PiecedArray } from '../../../shared/results/binary-answer'
import { fromSweepColumns, sweepPoint, type SweepColumns } from '../../../shared/results/sweep-columns'
import { solveTask } from '../../../server/workers/solve.worker'
import { benchSystemSource } from '../../../bench/systems'
import type { SweepResult } from '../../../shared/types/result'

function modelOf(source: string) {
  const { model, diagnostics } = compile(source)
  if (!model) throw new Error(diagnostics.map(d => d.message).join('; '))
  return model
}

/** The bytes a client receives: the chunks the server writes, one after the other, in a buffer of their own. */
function received(chunks: Uint8Array[]): ArrayBuffer {
  const out = new Uint8Array(chunks.reduce((a, c) => a + c.byteLength, 0))
  let at = 0
  for (const c of chunks) { out.set(c, at); at += c.byteLength }
  return out.buffer
}

/** Every number of a value in JSON order with its path, compared with Object.is (−0 and NaN too). */
function numbersOf(value: unknown, path = '', out: [string, number][] = []): [string, number][] {
  if (typeof value === 'number') out.push([path, value])
  else if (Array.isArray(value)) value.forEach((v, k) => numbersOf(v, `${path}[${k}]`, out))
  else if (value !== null && typeof value === 'object') for (const [k, v] of Object.entries(value)) numbersOf(v, `${path}.${k}`, out)
  return out
}

/** The worker's answer by columns, as the route frames it and a client decodes it. */
function columnsThroughTheWire(source: string): { columns: SweepColumns, envelope: { kind: string } } {
  const answer = solveTask({ model: modelOf(source), timeBudgetMs: 60_000, form: 'columns' })
  expect(answer.form).toBe('columns')
  const head = new TextEncoder().encode(`{"kind":"sweep","result":${new TextDecoder().decode(answer.resultBytes)}}`)
  const decoded = decodeBinaryAnswer<{ kind: string, result: SweepColumns }>(received(binaryAnswerChunks(head, answer.resultArrays!)))
  return { columns: decoded.result, envelope: decoded }
}

function pointsOf(source: string): SweepResult {
  const answer = solveTask({ model: modelOf(source), timeBudgetMs: 60_000, form: 'points' })
  expect(answer.form).toBe('points')
  return JSON.parse(new TextDecoder().decode(answer.resultBytes)) as SweepResult
}

describe('a sweep answered by columns', () => {
  const cases: [string, string][] = [
    ['the benchmark system, 400 points (chunks of rows in several templates)', benchSystemSource('sweep pH from 4 to 12 points 400')],
    ['nickel-rinse-discharge (limit windows)', readFileSync(resolve(import.meta.dirname, '../../../examples/nickel-rinse-discharge.poise'), 'utf8')],
    ['zinc-sulfide-dosing', readFileSync(resolve(import.meta.dirname, '../../../examples/zinc-sulfide-dosing.poise'), 'utf8')],
  ]

  it.each(cases)('decodes to the same points as the JSON answer, bit for bit: %s', (_name, source) => {
    const { columns, envelope } = columnsThroughTheWire(source)
    expect(envelope.kind).toBe('sweep')
    const points = pointsOf(source)
    const again = fromSweepColumns(columns)
    expect(JSON.stringify(again)).toBe(JSON.stringify(points))
    const want = numbersOf(points)
    const got = numbersOf(again)
    expect(got.length).toBe(want.length)
    const differing = got.filter(([path, v], k) => path !== want[k][0] || !Object.is(v, want[k][1]))
    expect(differing).toEqual([])
    if (/nickel-rinse/.test(_name)) expect(columns.limits?.length).toBeGreaterThan(0)
  }, 60_000)

  it('makes views on the received buffer, not copies', () => {
    const { head, arrays } = binaryParts({ a: new Float64Array([1.5, -0, Number.NaN]), b: new Uint16Array([1, 2, 3]), c: new Float64Array([2]) })
    const buffer = received(binaryAnswerChunks(new TextEncoder().encode(head), arrays))
    const back = decodeBinaryAnswer<{ a: Float64Array, b: Uint16Array, c: Float64Array }>(buffer)
    expect(back.a.buffer).toBe(buffer)
    expect(back.c.buffer).toBe(buffer)
    expect(Object.is(back.a[1], -0)).toBe(true)
    expect(Number.isNaN(back.a[2])).toBe(true)
    expect(Array.from(back.b)).toEqual([1, 2, 3])
    expect(back.c[0]).toBe(2)
  })

  it('writes an array given in pieces as one array', () => {
    const bytes = encodeBinaryAnswer({ x: new PiecedArray([new Float64Array([1, 2]), new Float64Array([3])]), after: new Uint32Array([7]) })
    const back = decodeBinaryAnswer<{ x: Float64Array, after: Uint32Array }>(bytes.buffer as ArrayBuffer)
    expect(Array.from(back.x)).toEqual([1, 2, 3])
    expect(Array.from(back.after)).toEqual([7])
  })

  it('makes the picked point on demand from the decoded columns', () => {
    const source = benchSystemSource('sweep pH from 4 to 12 points 40')
    const { columns } = columnsThroughTheWire(source)
    expect(sweepPoint(columns, 17)).toStrictEqual(pointsOf(source).points[17])
  })

  it('refuses bytes that are not such an answer, or cut short, with a message', () => {
    expect(isBinaryAnswer(new TextEncoder().encode('{"kind":"sweep"}'))).toBe(false)
    expect(() => decodeBinaryAnswer(new TextEncoder().encode('{"kind":"sweep"}').buffer as ArrayBuffer)).toThrow('not in the expected binary form')
    const whole = encodeBinaryAnswer({ x: new Float64Array(100) })
    expect(() => decodeBinaryAnswer(whole.slice(0, whole.byteLength - 8).buffer as ArrayBuffer)).toThrow('ends inside one of its arrays')
    expect(() => decodeBinaryAnswer(whole.slice(0, 12).buffer as ArrayBuffer)).toThrow('ends inside its head')
  })
})
