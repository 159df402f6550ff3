// The columnar sweep answer holds exactly the solver's per-point answers:
// every point made from the columns equals the point the solver made (same
// numbers bit for bit, same keys, same JSON), on every shipped example with
// a sweep and on the benchmark system.
import { readdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { sweep } from '../../../server/solver/index'
import { fromSweepColumns, sweepPoint, sweepQuantity, sweepView, toSweepColumns } from '../../../shared/results/sweep-columns'
import { benchSystemSource } from '../../../bench/systems'
import type { SweepResult } from '../../../shared/types/result'

const examplesDir = resolve(import.meta.dirname, '../../../examples')
const sweeps: [string, string][] = readdirSync(examplesDir)
  .filter(f => f.endsWith('.poise'))
  .map(f => [f, readFileSync(resolve(examplesDir, f), 'utf8')] as [string, string])
  .filter(([, source]) => /^sweep /m.test(source))

function solved(source: string): SweepResult {
  const { model, diagnostics } = compile(source)
  if (!model) throw new Error(diagnostics.map(d => d.message).join('; '))
  return sweep(model)
}

/** Every number of a value, in JSON order, with its path — to compare bit for bit (Object.is: −0 and NaN too). */
function numbersOf(value: unknown, path = '', out: [string, number][] = []): [string, number][] {
  if (typeof value === 'number') out.push([path, value])
  else if (Array.isArray(value)) value.forEach((v, k) => numbersOf(v, `${path}[${k}]`, out))
  else if (value !== null && typeof value === 'object') for (const [k, v] of Object.entries(value)) numbersOf(v, `${path}.${k}`, out)
  return out
}

function expectSame(answer: SweepResult) {
  const columns = toSweepColumns(answer)
  expect(columns.templateOf).toHaveLength(answer.points.length)
  const again = fromSweepColumns(columns)
  expect(JSON.stringify(again)).toBe(JSON.stringify(answer))
  expect(again).toStrictEqual(JSON.parse(JSON.stringify(answer)))
  const expectedNumbers = numbersOf(answer)
  const gotNumbers = numbersOf(again)
  expect(gotNumbers.length).toBe(expectedNumbers.length)
  for (let k = 0; k < expectedNumbers.length; k++) {
    if (!Object.is(gotNumbers[k][1], expectedNumbers[k][1]) || gotNumbers[k][0] !== expectedNumbers[k][0]) {
      expect(gotNumbers[k]).toEqual(expectedNumbers[k])
    }
  }
  // The view makes the same points on demand, and serialises to the same JSON.
  const view = sweepView(columns)
  expect(view.points[3]).toStrictEqual(sweepPoint(columns, 3))
  expect(view.points.filter(p => p.converged).length).toBe(answer.points.filter(p => p.converged).length)
  expect(JSON.stringify(view)).toBe(JSON.stringify(answer))
  return columns
}

describe('the columnar sweep answer', () => {
  it('has examples with sweeps to check', () => {
    expect(sweeps.length).toBeGreaterThanOrEqual(4)
  })

  it.each(sweeps)('equals the per-point answers of %s exactly', (_name, source) => {
    expectSame(solved(source))
  })

  it('equals the per-point answers of the benchmark system (300 points) exactly, with few shapes', () => {
    const answer = solved(benchSystemSource('sweep pH from 4 to 12 points 300'))
    const columns = expectSame(answer)
    // Solids joining and leaving change a point's shape (its `none` notes), not every point.
    expect(columns.templates.length).toBeLessThan(20)
  })

  it('gives one quantity along the sweep by name', () => {
    const answer = solved(benchSystemSource('sweep pH from 4 to 12 points 50'))
    const columns = toSweepColumns(answer)
    const copper = sweepQuantity(columns, ['species', 'Cu^2+', 'log10'])
    expect(Array.from(copper)).toEqual(answer.points.map(p => p.species.find(s => s.name === 'Cu^2+')!.log10))
    expect(Array.from(sweepQuantity(columns, ['pH']))).toEqual(answer.points.map(p => p.pH))
    expect(Array.from(sweepQuantity(columns, ['solids', 'Zn(OH)2(s)', 'amount']))).toEqual(answer.points.map(p => p.solids.find(s => s.name === 'Zn(OH)2(s)')!.amount))
    expect(sweepQuantity(columns, ['species', 'no such species', 'log10']).every(Number.isNaN)).toBe(true)
  })

  it('keeps a failed point, its reason and the sweep limits', () => {
    const answer = solved(benchSystemSource('sweep pH from 4 to 12 points 5'))
    const broken: SweepResult = { ...answer, points: [...answer.points], limits: [{ quantity: 'dissolved Cu', value: 1, unit: 'mg/L', ranges: [[4, 6.5]] }] }
    broken.points[2] = { ...broken.points[2], converged: false, reason: 'Did not converge: a test reason.' }
    const again = fromSweepColumns(toSweepColumns(broken))
    expect(again.points[2].reason).toBe('Did not converge: a test reason.')
    expect(again).toStrictEqual(JSON.parse(JSON.stringify(broken)))
  })
})
