/**
 * Monte Carlo over the constants (`uncertainty draws N [seed S]`) for sweeps
 * and titration curves: reproducible from its seed, and in a nearly linear
 * case its 2.5–97.5 % band is the linear ± of a single solve (for a normal
 * quantity the band is ± 1.96 σ: standard normal quantile, closed form).
 */
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'
import type { TitrationCurveResult } from '../../../shared/types/result'
import { solve, sweep, titration } from '../../../server/solver/index'
import { band, normalStream, quantile } from '../../../server/solver/montecarlo'

function model(text: string): Model {
  const r = compile(text)
  const errors = r.diagnostics.filter((d) => d.severity === 'error')
  if (errors.length) throw new Error(errors.map((d) => d.message).join('; '))
  return r.model!
}

// Acetic acid pKa 4.76 and water pKw 14.00 (from memory); the ± are invented.
const acetate = (sodium: string, study: string) => `system "Acetate buffer"
activity davies
component H+ balance
component CH3COO- total 10 mmol/L
component Na+ total ${sodium}
reaction H2O <=> H+ + OH- pKw 14.00 ± 0.01 cite "from memory"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 ± 0.03 cite "from memory"
${study}
`
const bufferSweep = (seed: number, draws = 400) => acetate('5 mmol/L', `sweep total Na+ from 3 mmol/L to 7 mmol/L points 5\nuncertainty draws ${draws} seed ${seed}`)

describe('the generator', () => {
  it('gives standard normal deviates: mean 0, SD 1, 95 % within ± 1.96 (closed form of the normal)', () => {
    const next = normalStream(42)
    const z = Float64Array.from({ length: 20000 }, next)
    const mean = z.reduce((a, b) => a + b, 0) / z.length
    const sd = Math.sqrt(z.reduce((a, b) => a + (b - mean) ** 2, 0) / (z.length - 1))
    expect(Math.abs(mean)).toBeLessThan(0.03)
    expect(Math.abs(sd - 1)).toBeLessThan(0.02)
    const inside = z.filter((v) => Math.abs(v) < 1.959963984540054).length / z.length
    expect(Math.abs(inside - 0.95)).toBeLessThan(0.006)
    expect(Array.from({ length: 5 }, normalStream(42))).toEqual(Array.from(z.slice(0, 5)))
    expect(Array.from({ length: 5 }, normalStream(43))).not.toEqual(Array.from(z.slice(0, 5)))
  })

  it('reads quantiles between order statistics and leaves out draws that failed', () => {
    expect(quantile([1, 2, 3, 4, 5], 0.5)).toBe(3)
    expect(quantile([1, 2, 3, 4, 5], 0.025)).toBeCloseTo(1.1, 12)
    expect(band(Float64Array.from([3, Number.NaN, 1, 2]))).toEqual({ sigma: (2.95 - 1.05) / (2 * 1.959963984540054), median: 2, low: 1.05, high: 2.95 })
    expect(band(Float64Array.from([Number.NaN]))).toBeNull()
  })
})

describe('Monte Carlo bands of a sweep', () => {
  it('contain the linear ± of a single solve where the answer is nearly linear in the constants', () => {
    const answer = sweep(model(bufferSweep(7)))
    const middle = answer.points[2]!
    expect(middle.uncertainty).toMatchObject({ method: 'monte-carlo', samples: 400, seed: 7, failed: 0 })
    const single = solve(model(acetate('5 mmol/L', '')))
    const sigma = single.pHUncertainty!.sigma
    const b = middle.pHUncertainty!
    // The band holds the single solve's pH ± σ, is as wide as ± 1.96 σ within 15 %, and centres on the pH.
    expect(b.low!).toBeLessThan(single.pH - sigma)
    expect(b.high!).toBeGreaterThan(single.pH + sigma)
    expect(Math.abs((b.high! - b.low!) / (2 * 1.96 * sigma) - 1)).toBeLessThan(0.15)
    expect(Math.abs(b.median! - single.pH)).toBeLessThan(0.25 * sigma)
    // The same for a species and a dissolved total that does move: log c of OH−.
    const oh = middle.species.find((s) => s.name === 'OH-')!.log10Uncertainty!
    const ohLinear = single.species.find((s) => s.name === 'OH-')!.log10Uncertainty!.sigma
    expect(Math.abs(oh.sigma / ohLinear - 1)).toBeLessThan(0.15)
  })

  it('gives the same bands for the same seed, other bands for another', () => {
    const a = sweep(model(bufferSweep(7, 60)))
    const b = sweep(model(bufferSweep(7, 60)))
    const c = sweep(model(bufferSweep(8, 60)))
    expect(a.points.map((p) => p.pHUncertainty)).toEqual(b.points.map((p) => p.pHUncertainty))
    expect(a.points.map((p) => p.species.map((s) => s.log10Uncertainty))).toEqual(b.points.map((p) => p.species.map((s) => s.log10Uncertainty)))
    expect(c.points[2]!.pHUncertainty!.low).not.toBe(a.points[2]!.pHUncertainty!.low)
  })

  it('draws nothing without the statement, and keeps the sweep’s own points unchanged', () => {
    const plain = sweep(model(acetate('5 mmol/L', 'sweep total Na+ from 3 mmol/L to 7 mmol/L points 5')))
    expect(plain.points.every((p) => p.uncertainty === undefined && p.pHUncertainty === undefined)).toBe(true)
    const drawn = sweep(model(bufferSweep(7, 40)))
    expect(drawn.points.map((p) => p.pH)).toEqual(plain.points.map((p) => p.pH))
  })
})

describe('Monte Carlo bands of a titration curve', () => {
  it('puts a band on every point of the curve, ± 1.96 σ of the pKa half way to the end point', () => {
    const text = acetate('0 mol/L', `sample volume 25 mL
titrant Na+ 0.1 mol/L
titrant OH- 0.1 mol/L
titrate from 0 to 2.5 mL points 5
uncertainty draws 100 seed 3`)
    const curve = titration(model(text)) as TitrationCurveResult
    expect(curve.points.every((p) => p.pHUncertainty !== undefined)).toBe(true)
    expect(curve.points[0]!.uncertainty).toMatchObject({ method: 'monte-carlo', samples: 100, seed: 3 })
    // Half way (1.25 mL of 2.5 mL to the end point) the pH is the pKa: its band is about ± 1.96 × 0.03.
    const half = curve.points[2]!.pHUncertainty!
    expect(half.high! - half.low!).toBeGreaterThan(2 * 1.96 * 0.03 * 0.8)
    expect(half.high! - half.low!).toBeLessThan(2 * 1.96 * 0.03 * 1.2)
  })
})

describe('Monte Carlo bands on their way out', () => {
  it('reach the worker’s streamed JSON, the sweep CSV and the diagram’s series', async () => {
    const { solveSweepToBytes } = await import('../../../server/workers/solve.worker')
    const { sweepCsv } = await import('../../../shared/results/export')
    const { diagramData } = await import('../../../shared/results/diagram')
    const m = model(bufferSweep(5, 40))
    const direct = sweep(m)
    const streamed = JSON.parse(new TextDecoder().decode(solveSweepToBytes(m, { timeBudgetMs: 20_000 }).bytes))
    expect(streamed.points[1].pHUncertainty).toEqual(direct.points[1]!.pHUncertainty)
    expect(streamed.points[1].uncertainty).toMatchObject({ method: 'monte-carlo', samples: 40, seed: 5 })

    const lines = sweepCsv(direct).split('\r\n')
    const header = lines[0]!.split(',')
    const row = lines[2]!.split(',')
    const at = (name: string) => Number(row[header.indexOf(name)])
    expect(at('pH 2.5 %')).toBe(direct.points[1]!.pHUncertainty!.low)
    expect(at('pH 97.5 %')).toBe(direct.points[1]!.pHUncertainty!.high)
    expect(at('OH- log10 c median')).toBe(direct.points[1]!.species.find((s) => s.name === 'OH-')!.log10Uncertainty!.median)
    expect(header[header.length - 1]).toBe('reason')

    const data = diagramData(direct, m, { kind: 'logConcentration', component: null, showAll: true })
    const oh = data.series.find((s) => s.key === 'OH-')!
    expect(oh.band!.low[1]).toBe(direct.points[1]!.species.find((s) => s.name === 'OH-')!.log10Uncertainty!.low)
    expect(oh.band!.high.every((v, k) => v >= oh.band!.low[k]!)).toBe(true)
    // Without draws the series have no band and the CSV no band columns.
    const plain = sweep(model(acetate('5 mmol/L', 'sweep total Na+ from 3 mmol/L to 7 mmol/L points 5')))
    expect(diagramData(plain, m, { kind: 'logConcentration', component: null, showAll: true }).series.some((s) => s.band)).toBe(false)
    expect(sweepCsv(plain)).not.toContain('2.5 %')
  })
})

describe('Monte Carlo bands through the columns the workbench receives', () => {
  it('come back on every point of the sweep view, equal to the solver’s', async () => {
    const { solveTask } = await import('../../../server/workers/solve.worker')
    const { decodeBinaryAnswer, binaryAnswerChunks } = await import('../../../shared/results/binary-answer')
    const { sweepView } = await import('../../../shared/results/sweep-columns')
    const m = model(bufferSweep(11, 40))
    const answer = solveTask({ model: m, timeBudgetMs: 60_000, form: 'columns' })
    const head = new TextEncoder().encode(`{"kind":"sweep","result":${new TextDecoder().decode(answer.resultBytes)}}`)
    const chunks = binaryAnswerChunks(head, answer.resultArrays!)
    const whole = new Uint8Array(chunks.reduce((n, c) => n + c.byteLength, 0))
    let at = 0
    for (const c of chunks) { whole.set(c, at); at += c.byteLength }
    const view = sweepView(decodeBinaryAnswer<{ result: Parameters<typeof sweepView>[0] }>(whole.buffer).result)
    const direct = sweep(m)
    for (let i = 0; i < direct.points.length; i++) {
      expect(view.points[i]!.pHUncertainty).toEqual(direct.points[i]!.pHUncertainty)
      expect(view.points[i]!.species.map((s) => s.log10Uncertainty)).toEqual(direct.points[i]!.species.map((s) => s.log10Uncertainty))
      expect(view.points[i]!.uncertainty).toEqual(direct.points[i]!.uncertainty)
    }
  })
})

describe('a fit of a file that asks for Monte Carlo draws', () => {
  it('fits its constants on exact solves alone, as if the draws line were not there', async () => {
    const { fitConstants } = await import('../../../server/solver/fit')
    const { parseDataSet } = await import('../../../shared/fit/dataset')
    const text = (draws: string) => acetate('0 mol/L', `sample volume 25 mL
titrant Na+ 0.1 mol/L
titrant OH- 0.1 mol/L
titrate from 0 to 2 mL points 5
${draws}`).replace('pKa 4.76 ± 0.03', 'pKa 4.70 ± 0.03 fit')
    // pH read off a curve with pKa 4.76 (invented measurements, rounded to 0.001).
    const truth = titration(model(text('').replace('pKa 4.70', 'pKa 4.76'))) as TitrationCurveResult
    const parsed = parseDataSet('volume mL,pH\n' + [0.25, 0.5, 0.75, 1, 1.25, 1.5, 1.75].map((v) => {
      const k = truth.values.findIndex((x) => Math.abs(x - v) < 1e-9)
      const at = k >= 0 ? truth.points[k]!.pH : (titration(model(text('').replace('pKa 4.70', 'pKa 4.76').replace('titrate from 0 to 2 mL points 5', `titrate from 0 to ${v} mL points 2`))) as TitrationCurveResult).points[1]!.pH
      return `${v},${at.toFixed(3)}`
    }).join('\n'))
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems))
    const plain = fitConstants(text(''), parsed.data)
    // 2000 draws at every step of the fit would take minutes: the fit must leave them out.
    const drawn = fitConstants(text('uncertainty draws 2000 seed 3'), parsed.data)
    expect(plain.ok && drawn.ok).toBe(true)
    if (!plain.ok || !drawn.ok) return
    expect(drawn.fit.constants).toEqual(plain.fit.constants)
    expect(Math.abs(drawn.fit.constants[0]!.value - 4.76)).toBeLessThan(0.01)
  })
})
