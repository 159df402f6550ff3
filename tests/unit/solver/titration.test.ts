/**
 * Titrations against closed forms: strong acid with strong base, a weak
 * monoprotic acid, a triprotic acid, buffer capacity, dilution by mass
 * balance at every point, and `titrate to pH` against the curve.
 */
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it, vi } from 'vitest'
import { runSolveCommand } from '../../../cli/solve'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'
import type { TitrationCurveResult, TitrationDoseResult } from '../../../shared/types/result'
import { solve, titration } from '../../../server/solver/index'

function model(text: string): Model {
  const r = compile(text)
  const errors = r.diagnostics.filter((d) => d.severity === 'error')
  if (errors.length) throw new Error(errors.map((d) => d.message).join('; '))
  return r.model!
}
const curve = (text: string) => titration(model(text)) as TitrationCurveResult
const dose = (text: string) => titration(model(text)) as TitrationDoseResult

// Kw = 1.0e-14 at 25 °C (from memory; any textbook of analytical chemistry).
const WATER = 'reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"\n'
const CAUSTIC = 'titrant Na+ 0.1000 mol/L\ntitrant OH- 0.1000 mol/L\n'

const strongAcid = (study: string) => `system "Hydrochloric acid with caustic"
activity ideal
component H+ balance
component Cl- total 0.1000 mol/L
component Na+ total 0 mol/L
${WATER}sample volume 25.00 mL
${CAUSTIC}${study}
`

describe('strong acid with strong base (closed form: H+ + OH- -> H2O, stoichiometry and Kw)', () => {
  const t = curve(strongAcid('titrate from 0 to 40 mL step 0.5'))

  it('solves every point and finds one end point, at V0·C0/Ct = 25.00 mL, pH 7 there (ideal, 25 °C)', () => {
    expect(t.kind).toBe('titration')
    expect(t.points.every((p) => p.converged)).toBe(true)
    expect(t.equivalencePoints).toHaveLength(1)
    const e = t.equivalencePoints[0]!
    // Better than a tenth of the step (0.05 mL) is asked; the refinement gives far better.
    expect(Math.abs(e.volume - 25)).toBeLessThan(0.05 / 100)
    expect(e.pH).toBeCloseTo(7, 2)
  })

  it('matches the closed form before and after the end point: [H+] or [OH-] = |C0·V0 − Ct·v| / (V0 + v)', () => {
    for (const v of [0, 5, 10, 20, 24.5, 25.5, 30, 40]) {
      const k = t.values.indexOf(v)
      const excess = (0.1 * 25 - 0.1 * v) / (25 + v)
      // Exact with water: [H+] − [OH-] = excess, [H+][OH-] = Kw.
      const root = Math.sqrt(excess * excess + 4e-14)
      const h = excess >= 0 ? (excess + root) / 2 : 2e-14 / (root - excess) // the same root, without cancellation
      expect(t.points[k]!.pH).toBeCloseTo(-Math.log10(h), 8)
    }
  })

  it('keeps every component\'s total at (V0·T0 + v·Tt)/(V0 + v): dilution by mass balance at every point', () => {
    t.values.forEach((v, k) => {
      const p = t.points[k]!
      const cl = p.components.find((c) => c.name === 'Cl-')!
      const na = p.components.find((c) => c.name === 'Na+')!
      expect(cl.total).toBeCloseTo((25 * 0.1) / (25 + v), 12)
      expect(na.total).toBeCloseTo((v * 0.1) / (25 + v), 12)
      // And the species account for them: Σ of the dissolved forms is the total.
      expect(p.species.find((s) => s.name === 'Cl-')!.concentration).toBeCloseTo((25 * 0.1) / (25 + v), 12)
    })
  })

  it('gives dpH/dv from the model, equal to the slope between close exact points', () => {
    const k = t.values.indexOf(20)
    const near = curve(strongAcid('titrate from 19.999 to 20.001 mL points 3'))
    const secant = (near.points[2]!.pH - near.points[0]!.pH) / 0.002
    expect(t.derivative[k]).toBeCloseTo(secant, 5)
  })

  it('doses to pH 7 at exactly the equivalence volume, and to pH 3 where the curve says', () => {
    const d = dose(strongAcid('titrate to pH 7'))
    expect(d.volume).toBeCloseTo(25, 6)
    expect(d.point!.pH).toBeCloseTo(7, 6)
    // pH 3: [H+] = 1e-3 = (2.5 − 0.1 v)/(25 + v) - Kw/1e-3 → v = (2.5 − 0.025·(1 − 1e-8))/(0.1 + 1e-3·(1 − 1e-8)).
    const d3 = dose(strongAcid('titrate to pH 3'))
    const excess = 1e-3 - 1e-11
    expect(d3.volume).toBeCloseTo((2.5 - 25 * excess) / (0.1 + excess), 6)
    // Against the curve: between the grid points around it.
    const k = t.points.findIndex((p) => p.pH > 3)
    expect(d3.volume!).toBeGreaterThan(t.values[k - 1]!)
    expect(d3.volume!).toBeLessThan(t.values[k]!)
  })

  it('says "not reachable with this titrant" for a pH the titrant cannot reach', () => {
    const low = dose(strongAcid('titrate to pH 0.5'))
    expect(low.volume).toBeNull()
    expect(low.point).toBeNull()
    expect(low.reason).toMatch(/^pH 0.5 is not reachable with this titrant: the pH goes from 1.00 \(no titrant\) to 13.00/)
    const high = dose(strongAcid('titrate to pH 13.5'))
    expect(high.reason).toMatch(/not reachable with this titrant/)
  })
})

// Acetic acid pKa 4.76 at 25 °C (from memory).
const weakAcid = (study: string) => `system "Acetic acid with caustic"
activity ideal
component H+ balance
component CH3COO- total 0.1000 mol/L
component Na+ total 0 mol/L
${WATER}reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 cite "from memory"
sample volume 25.00 mL
${CAUSTIC}${study}
`

describe('weak monoprotic acid (closed forms: Henderson–Hasselbalch at half equivalence; hydrolysis of the conjugate base)', () => {
  const t = curve(weakAcid('titrate from 0 to 40 mL step 0.25'))

  it('has pH = pKa at half equivalence in the ideal limit', () => {
    const p = t.points[t.values.indexOf(12.5)]!
    // pH = pKa + log10((Cb + [H+]) / (Ca − Cb − [H+])): the [H+] term moves it by under 0.001 here.
    expect(p.pH).toBeCloseTo(4.76, 2)
  })

  it('has the equivalence pH of the acetate formed: [OH-] = √(Kw/Ka · C), C = 0.05 mol/L after dilution', () => {
    const p = t.points[t.values.indexOf(25)]!
    const pOH = -Math.log10(Math.sqrt((1e-14 / 10 ** -4.76) * 0.05))
    expect(p.pH).toBeCloseTo(14 - pOH, 2)
    expect(t.equivalencePoints).toHaveLength(1)
    expect(Math.abs(t.equivalencePoints[0]!.volume - 25)).toBeLessThan(0.025)
  })

  it('gives the buffer capacity of the closed form β = 2.303 (C·Ka·[H+]/(Ka+[H+])² + [H+] + [OH-]) at every point', () => {
    const Ka = 10 ** -4.76
    t.values.forEach((v, k) => {
      const p = t.points[k]!
      const h = 10 ** -p.pH
      const C = (0.1 * 25) / (25 + v)
      const beta = Math.LN10 * ((C * Ka * h) / (Ka + h) ** 2 + h + 1e-14 / h)
      expect(p.bufferCapacity! / beta).toBeCloseTo(1, 6)
    })
  })

  it('gives the buffer capacity at the system\'s own composition on a single solve', () => {
    const m = model(weakAcid('titrate to pH 7'))
    const r = solve(m)
    const h = 10 ** -r.pH
    const Ka = 10 ** -4.76
    expect(r.bufferCapacity! / (Math.LN10 * ((0.1 * Ka * h) / (Ka + h) ** 2 + h + 1e-14 / h))).toBeCloseTo(1, 6)
  })
})

// Phosphoric acid pKa 2.15, 7.20, 12.35 at 25 °C (from memory).
const phosphoric = `system "Phosphoric acid with caustic"
activity ideal
component H+ balance
component PO4^3- total 0.05000 mol/L
component Na+ total 0 mol/L
${WATER}reaction HPO4^2- <=> PO4^3- + H+ pKa 12.35 cite "from memory"
reaction H2PO4- <=> HPO4^2- + H+ pKa 7.20 cite "from memory"
reaction H3PO4 <=> H2PO4- + H+ pKa 2.15 cite "from memory"
sample volume 20.00 mL
${CAUSTIC}titrate from 0 to 35 mL step 0.25
`

describe('triprotic acid (phosphoric acid: two visible end points, the third lost in the water)', () => {
  it('finds the end points at V0·C0/Ct and 2·V0·C0/Ct, not at the third', () => {
    const t = curve(phosphoric)
    expect(t.points.every((p) => p.converged)).toBe(true)
    expect(t.equivalencePoints.map((e) => Math.round(e.volume * 10) / 10)).toEqual([10, 20])
    // First end point at (pKa1 + pKa2)/2, second at (pKa2 + pKa3)/2 (amphiprotic salts, closed form, approximately).
    expect(t.equivalencePoints[0]!.pH).toBeGreaterThan(4.2)
    expect(t.equivalencePoints[0]!.pH).toBeLessThan(5.2)
    expect(t.equivalencePoints[1]!.pH).toBeGreaterThan(9.2)
    expect(t.equivalencePoints[1]!.pH).toBeLessThan(10.2)
  })
})

describe('titration answers that cannot be given', () => {
  it('says why for a model without a titration, never a stack trace', () => {
    const m = model(strongAcid('titrate to pH 7'))
    delete m.titration
    const t = titration(m) as TitrationCurveResult
    expect(t.points[0]!.converged).toBe(false)
    expect(t.points[0]!.reason).toBe('The model declares no titration.')
  })
})

describe('the examples and the command line', () => {
  const dir = fileURLToPath(new URL('../../../examples/', import.meta.url))

  it('standardises caustic against weighed phthalate: the end point gives the caustic concentration', () => {
    const t = titration(model(readFileSync(dir + 'caustic-standardised-against-phthalate.poise', 'utf8'))) as TitrationCurveResult
    // 0.5105 g / 204.22 g/mol = 2.4997 mmol (the file's 49.99 mmol/L in 50.00 mL); at 0.1000 mol/L that is 24.995 mL.
    expect(t.equivalencePoints).toHaveLength(1)
    expect(t.equivalencePoints[0]!.volume).toBeCloseTo(24.995, 2)
    // The phthalate ion's hydrolysis puts the end point in the alkaline range (phenolphthalein's), common practice.
    expect(t.equivalencePoints[0]!.pH).toBeGreaterThan(8.2)
    expect(t.equivalencePoints[0]!.pH).toBeLessThan(9.5)
  })

  it('neutralises the acid copper rinse: the acid first, then copper hydroxide drops out, then the second end point', () => {
    const t = titration(model(readFileSync(dir + 'acid-copper-rinse-neutralised.poise', 'utf8'))) as TitrationCurveResult
    // 2 mmol H2SO4 = 4 mmol H+ → 4 mL of 1 mol/L; 50 mg Cu / 63.546 g/mol = 0.787 mmol needs 1.574 mmol OH- more.
    expect(t.equivalencePoints.map((e) => Number(e.volume.toFixed(1)))).toEqual([4, 5.6])
    const first = t.points.findIndex((p) => p.solids.some((s) => s.name === 'Cu(OH)2(s)' && s.present))
    expect(t.values[first]).toBeGreaterThan(4)
    expect(t.values[first]).toBeLessThan(4.5)
  })

  it('prints the contract with solve --json and exits 0', async () => {
    const lines: string[] = []
    const log = vi.spyOn(console, 'log').mockImplementation((s: string) => { lines.push(s) })
    const err = vi.spyOn(console, 'error').mockImplementation(() => {})
    const code = await runSolveCommand([dir + 'caustic-standardised-against-phthalate.poise', '--json'])
    log.mockRestore(); err.mockRestore()
    expect(code).toBe(0)
    const out = JSON.parse(lines.join('\n')) as TitrationCurveResult
    expect(out.kind).toBe('titration')
    expect(out.sampleVolumeL).toBeCloseTo(0.05, 12)
    expect(out.values).toHaveLength(701)
    expect(out.points).toHaveLength(701)
    expect(out.points.every((p) => typeof p.bufferCapacity === 'number' && p.bufferCapacity > 0)).toBe(true)
    expect(out.equivalencePoints).toEqual([{ volume: expect.closeTo(24.995, 2), pH: expect.any(Number) }])
  })

  it('prints the dose in readable text in the unit of the file', async () => {
    const lines: string[] = []
    const log = vi.spyOn(console, 'log').mockImplementation((s: string) => { lines.push(s) })
    const text = readFileSync(dir + 'acid-copper-rinse-neutralised.poise', 'utf8').replace(/^titrate from .*$/m, 'titrate to pH 8.5')
    const { writeFileSync, mkdtempSync } = await import('node:fs')
    const { tmpdir } = await import('node:os')
    const file = mkdtempSync(tmpdir() + '/titration-') + '/dose.poise'
    writeFileSync(file, text)
    const code = await runSolveCommand([file])
    log.mockRestore()
    expect(code).toBe(0)
    expect(lines.join('\n')).toMatch(/pH 8.5 is reached after 0\.0055\d+ L of titrant/)
  })
})

describe('the solver pool task (what the API routes return)', () => {
  it('answers a titration with kind titration, counting an unreachable dose as an answer', async () => {
    const { solveTask } = await import('../../../server/workers/solve.worker')
    const text = (bytes: Uint8Array) => new TextDecoder().decode(bytes)
    const curveOut = solveTask({ model: model(strongAcid('titrate from 0 to 40 mL step 1')), timeBudgetMs: 10_000 })
    expect(curveOut.kind).toBe('titration')
    expect(curveOut.failedPoints).toBe(0)
    const parsed = JSON.parse(text(curveOut.resultBytes)) as TitrationCurveResult
    expect(parsed.equivalencePoints.map((e) => e.volume)).toEqual([expect.closeTo(25, 3)])
    const unreachable = solveTask({ model: model(strongAcid('titrate to pH 0.5')), timeBudgetMs: 10_000 })
    expect(unreachable.kind).toBe('titration')
    expect(unreachable.failedPoints).toBe(0)
    expect((JSON.parse(text(unreachable.resultBytes)) as TitrationDoseResult).reason).toMatch(/not reachable/)
  })
})

describe('comparing revisions', () => {
  it('does not compare titration answers point by point, and says so instead of failing', async () => {
    const { incomparableReason } = await import('../../../shared/diff/results-diff')
    const a = titration(model(strongAcid('titrate from 0 to 40 mL step 1')))
    const b = titration(model(strongAcid('titrate to pH 7')))
    expect(incomparableReason(a as never, b as never)).toMatch(/^Titration answers are not compared point by point/)
  })
})

describe('species along the added volume', () => {
  it('draws the distribution of copper along the rinse\'s titration, the hydroxide taking it over after the acid end point', async () => {
    const { titrationAsSweep } = await import('../../../shared/results/titration')
    const { diagramData } = await import('../../../shared/results/diagram')
    const dir = fileURLToPath(new URL('../../../examples/', import.meta.url))
    const m = model(readFileSync(dir + 'acid-copper-rinse-neutralised.poise', 'utf8'))
    const t = titration(m) as TitrationCurveResult
    const data = diagramData(titrationAsSweep(t), m, { kind: 'distribution', component: 'Cu^2+' })
    expect(data.xLabel).toBe('Added titrant (mL)')
    expect(data.x).toEqual(t.values)
    const free = data.series.find((s) => s.key === 'Cu^2+')!
    // Before any caustic the dissolved copper is Cu²⁺ (pH 2.5); past the second end point the hydroxide has taken it out.
    expect(free.values[0]).toBeGreaterThan(0.99)
    const logs = diagramData(titrationAsSweep(t), m, { kind: 'logConcentration', component: null }).series.find((s) => s.key === 'Cu^2+')!
    expect(logs.values[0]! - logs.values.at(-1)!).toBeGreaterThan(3)
  })
})

describe('limits along a titration', () => {
  const dir = fileURLToPath(new URL('../../../examples/', import.meta.url))
  const text = readFileSync(dir + 'acid-copper-rinse-neutralised.poise', 'utf8')
  // Cu 63.546 g/mol (IUPAC standard atomic weights): mol/L → mg/L.
  const copperMg = (t: TitrationCurveResult, k: number) => t.points[k]!.components.find((c) => c.name === 'Cu^2+')!.dissolved! * 63.546e3

  it('gives the added volumes where dissolved copper is at or below the limit, the start located by exact solves', () => {
    const t = titration(model(text)) as TitrationCurveResult
    expect(t.limits).toHaveLength(1)
    const [range] = t.limits![0]!.ranges
    expect(t.limits![0]!.ranges).toHaveLength(1)
    expect(range![1]).toBe(6)
    expect(range![0]).toBeGreaterThan(5.5)
    expect(range![0]).toBeLessThan(5.58)
    // At the start the limit holds; a thousandth of a mL earlier it does not.
    const start = range![0]
    const at = titration(model(text.replace(/^titrate from .*$/m, `titrate from ${start - 1e-3} to ${start} mL points 2`))) as TitrationCurveResult
    expect(copperMg(at, 1)).toBeLessThanOrEqual(0.5)
    expect(copperMg(at, 0)).toBeGreaterThan(0.5)
  })

  it('warns that a limit does nothing beside a dose, not beside a curve', () => {
    expect(compile(text).diagnostics.map((d) => d.code)).not.toContain('W109')
    expect(compile(text.replace(/^titrate from .*$/m, 'titrate to pH 8.5')).diagnostics.map((d) => d.code)).toContain('W109')
  })
})
