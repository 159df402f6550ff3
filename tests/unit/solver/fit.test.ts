/**
 * Fitting constants to data generated here from known constants plus
 * seeded Gaussian noise. The checks: the fitted values lie within three
 * standard errors of the truth, and the standard errors agree within a
 * factor of two with the linearised expectation σ²(JᵀJ)⁻¹, computed here
 * independently: J by central differences of exact solves of the true
 * model, σ the noise we added (the standard result for least squares with
 * independent errors of equal variance; common practice).
 */
import { describe, expect, it } from 'vitest'
import { Matrix, inverse } from 'ml-matrix'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'
import type { Result, TitrationCurveResult } from '../../../shared/types/result'
import { sweep, titration } from '../../../server/solver/index'
import { fitConstants, CORRELATION_WARNING, type FitResult } from '../../../server/solver/fit'
import { parseDataSet, type DataSet } from '../../../shared/fit/dataset'

function model(text: string): Model {
  const r = compile(text)
  const errors = r.diagnostics.filter((d) => d.severity === 'error')
  if (errors.length) throw new Error(errors.map((d) => d.message).join('; '))
  return r.model!
}

/** A seeded normal deviate (Park–Miller generator, Box–Muller transform). */
function normal(seed: number): () => number {
  let s = seed
  const uniform = () => { s = (s * 16807) % 2147483647; return s / 2147483647 }
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
}

/** pH along a titration of `text` at the given volumes (mL). */
function titrationPH(text: string, volumes: number[]): number[] {
  const m = model(text)
  const out = titration({ ...m, titration: { ...m.titration!, values: volumes, targetPH: null } }) as TitrationCurveResult
  expect(out.points.every((p) => p.converged)).toBe(true)
  return out.points.map((p) => p.pH)
}

function sweepPoints(text: string, values: number[]): Result[] {
  const m = model(text)
  const out = sweep({ ...m, sweep: { variable: 'pH', component: null, values, log: false, line: 0 } })
  expect(out.points.every((p) => p.converged)).toBe(true)
  return out.points
}

function data(csv: string): DataSet {
  const parsed = parseDataSet(csv)
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems))
  return parsed.data
}

/** The text with `fit` written after the constant on each of the lines (1-based). */
function mark(text: string, lines: number[]): string {
  return text.split('\n').map((l, i) => (lines.includes(i + 1) ? l.replace(/(\b(?:pKa|pKw|pKsp|logK) -?[\d.]+)/, '$1 fit') : l)).join('\n')
}

function fitted(text: string, set: DataSet, lines: number[]): FitResult {
  const out = fitConstants(mark(text, lines), set)
  if (!out.ok) throw new Error(out.message)
  return out.fit
}

/**
 * The linearised standard errors of the constants on `lines` (in log K =
 * the p-kinds' units), for noise σ on every value that `values(text)` gives:
 * J by central differences of exact solves with each constant moved by ±h.
 */
function linearisedErrors(text: string, constants: { line: number; kind: string; value: number }[], values: (text: string) => number[], sigma: number): number[] {
  const h = 1e-4
  const lines = text.split('\n')
  const moved = (k: number, by: number) => {
    const c = constants[k]!
    const copy = lines.slice()
    copy[c.line - 1] = copy[c.line - 1]!.replace(`${c.kind} ${c.value.toFixed(2)}`, `${c.kind} ${c.value + by}`)
    expect(copy[c.line - 1]).not.toBe(lines[c.line - 1])
    return copy.join('\n')
  }
  const columns = constants.map((_, k) => {
    const up = values(moved(k, h))
    const down = values(moved(k, -h))
    return up.map((u, i) => (u - down[i]!) / (2 * h))
  })
  const J = new Matrix(columns[0]!.length, constants.length)
  columns.forEach((col, k) => col.forEach((x, i) => J.set(i, k, x)))
  const cov = inverse(J.transpose().mmul(J)).mul(sigma * sigma)
  return constants.map((_, k) => Math.sqrt(cov.get(k, k)))
}

// Kw = 1.0e-14 at 25 °C (from memory; any textbook of analytical chemistry).
const WATER = 'reaction H2O <=> H+ + OH-           pKw 14.00  cite "from memory"'

const monoprotic = (pKa: string) => `system "A weak acid titrated with caustic"
activity ideal
component H+        balance
component CH3COO-   total 10 mmol/L
component Na+       total 0 mol/L
${WATER}
reaction CH3COOH <=> CH3COO- + H+   pKa ${pKa}   cite "invented for this test"
sample volume 50 mL
titrant Na+ 0.1 mol/L
titrant OH- 0.1 mol/L
titrate from 0 to 8 mL step 0.5
`

describe('a monoprotic acid titration (pH against added volume, σ = 0.01)', () => {
  const truth = 4.76
  const sigma = 0.01
  const volumes = Array.from({ length: 36 }, (_, i) => 0.2 * (i + 1))
  const noise = normal(11)
  const pH = titrationPH(monoprotic(truth.toFixed(2)), volumes)
  const csv = 'volume mL,pH\n' + volumes.map((v, i) => `${v.toFixed(2)},${(pH[i]! + sigma * noise()).toFixed(5)}`).join('\n')
  const fit = fitted(monoprotic('4.40'), data(csv), [7])
  const expected = linearisedErrors(monoprotic(truth.toFixed(2)), [{ line: 7, kind: 'pKa', value: truth }], (t) => titrationPH(t, volumes), sigma)

  it('converges from pKa 4.40 to within three standard errors of the true 4.76', () => {
    expect(fit.converged).toBe(true)
    expect(fit.constants).toHaveLength(1)
    const c = fit.constants[0]!
    expect(c.reaction).toBe('CH3COOH <=> CH3COO- + H+')
    expect(c.kind).toBe('pKa')
    expect(c.initial).toBe(4.4)
    expect(c.standardError).not.toBeNull()
    expect(Math.abs(c.value - truth)).toBeLessThan(3 * c.standardError!)
  })
  it('gives a standard error within a factor of two of the linearised expectation, and s near the noise', () => {
    const se = fit.constants[0]!.standardError!
    expect(se / expected[0]!).toBeGreaterThan(0.5)
    expect(se / expected[0]!).toBeLessThan(2)
    expect(fit.residualStandardDeviation / sigma).toBeGreaterThan(0.6)
    expect(fit.residualStandardDeviation / sigma).toBeLessThan(1.5)
  })
  it('counts points and degrees of freedom, and gives residuals and a curve over the data', () => {
    expect(fit.points).toBe(36)
    expect(fit.degreesOfFreedom).toBe(35)
    expect(fit.correlation).toEqual([[1]])
    expect(fit.warnings).toEqual([])
    const column = fit.columns[0]!
    expect(column.residual.every((r) => r !== null && Math.abs(r) < 5 * sigma)).toBe(true)
    expect(fit.curve.values[0]).toBeCloseTo(0.2, 10)
    expect(fit.curve.values.at(-1)).toBeCloseTo(7.2, 10)
    expect(fit.curve.columns[0]!.values.every((y) => y !== null && y > 2 && y < 13)).toBe(true)
  })
})

const diprotic = (pKa1: string, pKa2: string) => `system "A diprotic acid titrated with caustic"
activity ideal
component H+         balance
component C4H4O4^2-  total 10 mmol/L
component Na+        total 0 mol/L
${WATER}
reaction C4H5O4- <=> C4H4O4^2- + H+   pKa ${pKa2}   cite "invented for this test"
reaction C4H6O4 <=> C4H5O4- + H+      pKa ${pKa1}   cite "invented for this test"
sample volume 50 mL
titrant Na+ 0.1 mol/L
titrant OH- 0.1 mol/L
titrate from 0 to 12 mL step 0.5
`

describe('a diprotic acid titration (two pKa fitted together, σ = 0.01)', () => {
  const truth = { pKa1: 3.90, pKa2: 6.20 }
  const sigma = 0.01
  const volumes = Array.from({ length: 45 }, (_, i) => 0.2 * (i + 1))
  const noise = normal(29)
  const text = diprotic(truth.pKa1.toFixed(2), truth.pKa2.toFixed(2))
  const pH = titrationPH(text, volumes)
  const csv = 'volume mL,pH\n' + volumes.map((v, i) => `${v.toFixed(2)},${(pH[i]! + sigma * noise()).toFixed(5)}`).join('\n')
  const fit = fitted(diprotic('4.30', '5.80'), data(csv), [8, 7])
  const expected = linearisedErrors(text, [{ line: 7, kind: 'pKa', value: truth.pKa2 }, { line: 8, kind: 'pKa', value: truth.pKa1 }], (t) => titrationPH(t, volumes), sigma)

  it('converges to within three standard errors of both true values, in the order of the file', () => {
    expect(fit.converged).toBe(true)
    expect(fit.constants.map((c) => c.reaction)).toEqual(['C4H5O4- <=> C4H4O4^2- + H+', 'C4H6O4 <=> C4H5O4- + H+'])
    const [b, a] = fit.constants
    expect(Math.abs(a!.value - truth.pKa1)).toBeLessThan(3 * a!.standardError!)
    expect(Math.abs(b!.value - truth.pKa2)).toBeLessThan(3 * b!.standardError!)
  })
  it('gives standard errors within a factor of two of the linearised expectation', () => {
    fit.constants.forEach((c, k) => {
      expect(c.standardError! / expected[k]!).toBeGreaterThan(0.5)
      expect(c.standardError! / expected[k]!).toBeLessThan(2)
    })
  })
  it('gives a symmetric correlation matrix with ones on its diagonal', () => {
    expect(fit.correlation).toHaveLength(2)
    expect(fit.correlation[0]![0]).toBe(1)
    expect(fit.correlation[1]![1]).toBe(1)
    expect(fit.correlation[0]![1]).toBeCloseTo(fit.correlation[1]![0]!, 12)
    expect(Math.abs(fit.correlation[0]![1]!)).toBeLessThan(1)
  })
})

// Ksp of a metal hydroxide and its first hydrolysis constant: invented for this test, of the size found for divalent metals.
const solubility = (pKsp: string) => `system "A hydroxide's solubility against pH"
activity ideal
component H+     pH 7
component Cu^2+  total 1 mmol/L
component Cl-    total 2 mmol/L
${WATER}
reaction Cu^2+ + H2O <=> CuOH+ + H+       logK -7.50   cite "invented for this test"
reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH-     pKsp ${pKsp}  cite "invented for this test"
`

describe('a solubility series against pH (dissolved Cu in mg/L)', () => {
  const truth = 19.30
  const values = Array.from({ length: 21 }, (_, i) => 6.0 + 0.1 * i)
  const points = sweepPoints(solubility(truth.toFixed(2)), values)
  const noise = normal(5)
  const grams = 63.546 // Cu, IUPAC standard atomic weight
  const measured = points.map((p) => p.components.find((c) => c.name === 'Cu^2+')!.dissolved! * grams * 1000)
  // Noise of 0.05 mg/L on every value; a value the noise takes to 0 or below is not reported (as an instrument would not).
  const rows = values.map((v, i) => ({ v, y: measured[i]! + 0.05 * noise() })).filter((r) => r.y > 0)
  const csv = 'pH,dissolved Cu mg/L\n' + rows.map((r) => `${r.v.toFixed(2)},${r.y.toPrecision(6)}`).join('\n')
  const fit = fitted(solubility('18.80'), data(csv), [8])

  it('fits pKsp from 18.80 to within three standard errors of the true 19.30', () => {
    expect(fit.converged).toBe(true)
    const c = fit.constants[0]!
    expect(c.kind).toBe('pKsp')
    expect(c.reaction).toBe('Cu(OH)2(s) <=> Cu^2+ + 2 OH-')
    expect(Math.abs(c.value - truth)).toBeLessThan(3 * c.standardError!)
    expect(c.standardError!).toBeLessThan(0.05)
    expect(fit.columns[0]!.header).toBe('dissolved Cu mg/L')
    expect(fit.residualStandardDeviation / 0.05).toBeGreaterThan(0.5)
    expect(fit.residualStandardDeviation / 0.05).toBeLessThan(1.6)
  })
})

describe('what the data cannot tell', () => {
  // Before the end point (5 mL) the pH stays below 6: OH- is a vanishing share, so Kw leaves no mark on these data.
  const volumes = Array.from({ length: 12 }, (_, i) => 0.25 * (i + 1))
  const noise = normal(3)
  const pH = titrationPH(monoprotic('4.76'), volumes)
  const csv = 'volume mL,pH\n' + volumes.map((v, i) => `${v},${(pH[i]! + 0.01 * noise()).toFixed(5)}`).join('\n')

  it('flags a constant the data do not determine, and says what data would', () => {
    const fit = fitted(monoprotic('4.76'), data(csv), [7, 6])
    const water = fit.constants.find((c) => c.kind === 'pKw')!
    expect(water.standardError).toBeNull()
    expect(fit.warnings.some((w) => w.startsWith('pKw of H2O <=> H+ + OH- is not determined by these data') && w.includes('would determine it'))).toBe(true)
    // The acid's own constant is still determined.
    expect(fit.constants.find((c) => c.kind === 'pKa')!.standardError).not.toBeNull()
  })

  it('warns when two constants are correlated beyond |r| > 0.95, and not otherwise', () => {
    // Close pKa values seen only at the very start of the curve: both acid steps buffer there together.
    const text = diprotic('4.50', '4.80')
    const early = Array.from({ length: 30 }, (_, i) => (i + 1) * 0.5 / 30)
    const noiseHere = normal(7)
    const start = titrationPH(text, early)
    const set = data('volume mL,pH\n' + early.map((v, i) => `${v},${(start[i]! + 0.01 * noiseHere()).toFixed(5)}`).join('\n'))
    const fit = fitted(diprotic('4.00', '5.00'), set, [8, 7])
    expect(Math.abs(fit.correlation[0]![1]!)).toBeGreaterThan(CORRELATION_WARNING)
    expect(fit.warnings).toEqual([expect.stringMatching(/^pKa of C4H5O4- <=> C4H4O4\^2- \+ H\+ and pKa of C4H6O4 <=> C4H5O4- \+ H\+ are correlated \(r = -0\.9\d\d\): .*wider range of volume mL/)])
  })

  it('refuses with a message: nothing to fit, fewer values than constants, a column the model cannot predict, a volume without a titration', () => {
    const set = data(csv)
    const none = fitConstants(monoprotic('4.76'), set)
    expect(none).toEqual({ ok: false, message: expect.stringContaining('No constant is marked to fit: write `fit` after the value') })
        const tooFew = fitConstants(mark(monoprotic('4.76'), [7, 6]), data('volume mL,pH\n1,4.2\n'))
    expect(tooFew).toEqual({ ok: false, message: '2 constants to fit need more than 2 measured values; the data set has 1. Add measurements, or fit fewer constants.' })
    const unknown = fitConstants(mark(monoprotic('4.76'), [7]), data('volume mL,pH,Cu^2+ mol/L\n1,4.2,1e-3\n2,4.5,1e-3\n'))
    expect(unknown.ok).toBe(false)
    if (!unknown.ok) expect(unknown.message).toMatch(/^Column 3 \(Cu\^2\+ mol\/L\): the model has no species Cu\^2\+; its species are H\+, CH3COO-/)
    const noTitration = fitConstants(mark(solubility('19.30'), [8]), set)
    expect(noTitration.ok).toBe(false)
    if (!noTitration.ok) expect(noTitration.message).toMatch(/^Column 1 \(volume mL\): an added volume needs a titration in the model/)
  })
})
