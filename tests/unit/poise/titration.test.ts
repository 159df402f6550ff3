/** The titration statements: `sample volume`, `titrant`, `titrate`, their model and every error. */
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { SIZE_LIMITS } from '../../../shared/poise/limits'

const SAMPLE = `system "Hydrochloric acid with caustic"
component H+ balance
component Cl- total 0.1 mol/L
component Na+ total 0 mol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
`
const CURVE = `sample volume 25.00 mL
titrant Na+ 0.1000 mol/L
titrant OH- 0.1000 mol/L
titrate from 0 to 40 mL step 0.05
`

function errors(text: string): { code: string; message: string; line: number }[] {
  return compile(text).diagnostics.filter((d) => d.severity === 'error').map((d) => ({ code: d.code, message: d.message, line: d.range.line }))
}

describe('titration statements', () => {
  it('compile the form of the contract into the model: sample in L, added volumes in mL, the titrant over the components', () => {
    const r = compile(SAMPLE + CURVE)
    expect(r.diagnostics).toEqual([])
    const t = r.model!.titration!
    expect(t.sampleVolumeL).toBeCloseTo(0.025, 15)
    expect(t.values).toHaveLength(801)
    expect(t.values![0]).toBe(0)
    expect(t.values![1]).toBe(0.05)
    expect(t.values![800]).toBe(40)
    expect(t.titrant).toEqual([{ species: 'Na+', concentration: 0.1, line: 7 }, { species: 'OH-', concentration: 0.1, line: 8 }])
    // OH- is H2O − H+: the titrant takes 0.1 mol/L of protons and brings 0.1 mol/L of Na+.
    expect(t.titrantTotals).toEqual([-0.1, 0, 0.1])
    expect(t.targetPH).toBeNull()
    expect(t.unit).toBe('mL')
  })

  it('read every volume unit, points, a titrant in mg/L, and the dose form', () => {
    const r = compile(SAMPLE + `sample volume 0.5 L
titrant Na+ 2299 mg/L
titrant OH- 100 mmol/L
titrate from 0 µL to 500 uL points 11
`)
    expect(r.diagnostics).toEqual([])
    const t = r.model!.titration!
    expect(t.sampleVolumeL).toBe(0.5)
    // 2299 mg/L of Na (22.990 g/mol, IUPAC abridged atomic weights) is 0.1000 mol/L.
    expect(t.titrant[0]!.concentration).toBeCloseTo(2.299 / 22.990, 8)
    expect(t.values).toHaveLength(11)
    expect(t.values![10]).toBeCloseTo(0.5, 12)
    expect(t.unit).toBe('uL')
    const dose = compile(SAMPLE + 'sample volume 2 L\ntitrant Na+ 0.1 mol/L\ntitrant OH- 0.1 mol/L\ntitrate to pH 7\n').model!.titration!
    expect(dose.targetPH).toBe(7)
    expect(dose.values).toBeNull()
    expect(dose.unit).toBe('L')
  })

  it('refuse a titrant that is not electroneutral and say by how much', () => {
    const e = errors(SAMPLE + 'sample volume 25 mL\ntitrant Na+ 0.1000 mol/L\ntitrant OH- 0.0900 mol/L\ntitrate to pH 7\n')
    expect(e).toHaveLength(1)
    expect(e[0]!.code).toBe('P093')
    expect(e[0]!.message).toMatch(/not electroneutral: its charges sum to \+0\.01 mol\/L/)
  })

  it('refuse a titrant species the system cannot express, and say how to declare it', () => {
    const e = errors(SAMPLE + 'sample volume 25 mL\ntitrant K+ 0.1 mol/L\ntitrant OH- 0.1 mol/L\ntitrate to pH 7\n')
    expect(e.map((x) => x.code)).toEqual(['P092'])
    expect(e[0]!.message).toMatch(/K\+ is no species this system can express.*component K\+ total 0 mol\/L/)
    expect(e[0]!.line).toBe(7)
  })

  it('refuse a titrant that brings a component held at a fixed free concentration', () => {
    const text = SAMPLE.replace('component Na+ total 0 mol/L', 'component Na+ free 1 mmol/L') + 'sample volume 25 mL\ntitrant Na+ 0.1 mol/L\ntitrant OH- 0.1 mol/L\ntitrate to pH 7\n'
    const e = errors(text)
    expect(e.map((x) => x.code)).toEqual(['P092'])
    expect(e[0]!.message).toMatch(/declare Na\+ with `total`/)
  })

  it('refuse titrate without sample volume', () => {
    const e = errors(SAMPLE + 'titrant Na+ 0.1 mol/L\ntitrant OH- 0.1 mol/L\ntitrate from 0 to 10 mL step 1\n')
    expect(e).toEqual([{ code: 'P090', message: expect.stringMatching(/needs the volume of the sample: add `sample volume N mL`/), line: 8 }])
  })

  it('refuse titrate without a titrant', () => {
    const e = errors(SAMPLE + 'sample volume 25 mL\ntitrate from 0 to 10 mL step 1\n')
    expect(e.map((x) => x.code)).toEqual(['P090'])
    expect(e[0]!.message).toMatch(/needs its titrant/)
  })

  it('refuse a titration and a sweep in one file', () => {
    const e = errors(SAMPLE + CURVE + 'sweep pH from 2 to 12 step 1\n')
    expect(e.map((x) => x.code)).toEqual(['P090'])
    expect(e[0]!.message).toMatch(/one study, a titration or a sweep/)
  })

  it('refuse negative volumes wherever they are written', () => {
    expect(errors(SAMPLE + CURVE.replace('25.00 mL', '-25.00 mL')).map((x) => [x.code, x.message])).toEqual([['P052', 'the sample volume cannot be negative: a volume is 0 or more']])
    expect(errors(SAMPLE + CURVE.replace('from 0 to 40', 'from -1 to 40')).map((x) => x.code)).toEqual(['P052'])
    expect(errors(SAMPLE + CURVE.replace('step 0.05', 'step -0.05')).map((x) => x.code)).toEqual(['P052'])
    expect(errors(SAMPLE + CURVE.replace('25.00 mL', '0 mL')).map((x) => x.message)).toEqual(['the sample volume must be above 0'])
    expect(errors(SAMPLE + CURVE.replace('from 0 to 40', 'from 40 to 0')).map((x) => x.message)[0]).toMatch(/last volume \(0\) must be above its first \(40\)/)
  })

  it('take volume ranges and point counts from the limits module', () => {
    expect(errors(SAMPLE + CURVE.replace('25.00 mL', '2e6 L')).map((x) => [x.code, x.message])).toEqual([
      ['P083', expect.stringMatching(/the sample volume is 2e\+?6 L, outside the range Poise accepts \(from 0 to 1e\+?6 L\)/)],
    ])
    const many = errors(SAMPLE + CURVE.replace('step 0.05', 'step 0.001'))
    expect(many.map((x) => x.code)).toEqual(['P080'])
    expect(many[0]!.message).toContain(`2 to ${SIZE_LIMITS.maxSweepPoints}`)
    expect(errors(SAMPLE + CURVE.replace('step 0.05', `points ${SIZE_LIMITS.maxSweepPoints + 1}`))[0]!.message).toContain(`from 2 to ${SIZE_LIMITS.maxSweepPoints}`)
    expect(errors(SAMPLE + 'sample volume 25 mL\ntitrant Na+ 0.1 mol/L\ntitrant OH- 0.1 mol/L\ntitrate to pH 17\n').map((x) => x.code)).toEqual(['P083'])
  })

  it('refuse a volume without a volume unit, and a concentration unit on a volume', () => {
    expect(errors(SAMPLE + CURVE.replace('25.00 mL', '25.00')).map((x) => x.message)).toEqual(['expected a volume unit: mL, L, uL or µL after 25.00'])
    expect(errors(SAMPLE + CURVE.replace('40 mL', '40 mol/L')).map((x) => x.message)).toEqual(['mol/L is not a volume unit: mL, L, uL or µL'])
  })

  it('refuse a titration while the pH is held', () => {
    const e = errors(SAMPLE.replace('component H+ balance', 'component H+ pH 7') + CURVE)
    expect(e.map((x) => x.code)).toEqual(['P090'])
    expect(e[0]!.message).toMatch(/write `component H\+ balance`/)
  })

  it('warn when sample volume and titrant stand without titrate; refuse two sample volumes', () => {
    const r = compile(SAMPLE + 'sample volume 25 mL\ntitrant Na+ 0.1 mol/L\ntitrant OH- 0.1 mol/L\n')
    expect(r.diagnostics.map((d) => [d.severity, d.code])).toEqual([['warning', 'W110']])
    expect(errors(SAMPLE + CURVE + 'sample volume 20 mL\n').map((x) => x.message)).toEqual(['`sample volume` is given twice: keep one (one sample volume a file)'])
  })
})
