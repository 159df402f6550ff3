/**
 * Every number the checker reads is finite and in the range of its quantity:
 * an error (P082 or P083) or a warning (W106) otherwise, each message stating
 * the range. The ranges themselves live in shared/poise/limits.ts.
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { formatNumber, LIMITS, SIZE_LIMITS, rangeText } from '../../../shared/poise/limits'
import { SOLVE_LIMITS } from '../../../server/utils/solve-limits'
import { solve, sweep } from '../../../server/solver/index'
import { CLEAN } from './helpers'

const withLine = (line: string) => CLEAN + line + '\n'
const replacing = (from: string, to: string) => {
  if (!CLEAN.includes(from)) throw new Error(`test setup: ${from} not in CLEAN`)
  return CLEAN.replace(from, to)
}
const NON_FINITE = /NaN|Infinity|∞/

function only(source: string, code: string, count = 1) {
  const r = compile(source)
  const found = r.diagnostics.filter((d) => d.code === code)
  expect(found, JSON.stringify(r.diagnostics.map((d) => `${d.code} ${d.message}`))).toHaveLength(count)
  for (const d of r.diagnostics) expect(d.message).not.toMatch(NON_FINITE)
  return { ...r, found: found[0]! }
}

describe('numbers double precision cannot carry are refused (P082)', () => {
  it.each([
    ['a total of 1e309', replacing('total 1 mmol/L', 'total 1e309 mol/L'), 1],
    ['a total of -1e309 H+', replacing('component H+ balance', 'component H+ total -1e309 mol/L'), 1],
    ['a pH of 10^400', replacing('component H+ balance', 'component H+ pH 10^400'), 1],
    ['a total of 1e-400 (would read as 0)', replacing('total 1 mmol/L', 'total 1e-400 mol/L'), 1],
    ['a denormal total', replacing('total 1 mmol/L', 'total 5e-324 mol/L'), 1],
    ['a K of 1e309', replacing('logK -7.95', 'K 1e309'), 1],
    ['sweep ends of ±1e309', withLine('sweep pH from -1e309 to 1e309 step 1'), 2],
  ] as const)('%s', (_, source, count) => {
    const { found, model } = only(source, 'P082', count)
    expect(model).toBeNull()
    expect(found.message).toContain('between 2.22507e-308 and 1.79769e308')
  })
  it('reads a written zero as zero', () => {
    expect(compile(replacing('total 2 mmol/L', 'total 0e5 mmol/L')).diagnostics.filter((d) => d.severity === 'error')).toEqual([])
  })
})

describe('each quantity has a range; outside it an error with the range (P083)', () => {
  const cases: [string, string, string, number?][] = [
    ['pH 1e308', replacing('component H+ balance', 'component H+ pH 1e308'), 'from -2 to 16'],
    ['pH -100', replacing('component H+ balance', 'component H+ pH -100'), 'from -2 to 16'],
    ['a sweep of pH from -1e308 to 1e308 (both ends)', withLine('sweep pH from -1e308 to 1e308 step 1'), 'from -2 to 16', 2],
    ['temperature 1e308 C', withLine('temperature 1e308 C'), 'from 0 to 100 °C'],
    ['temperature 150 C', withLine('temperature 150 C'), 'from 0 to 100 °C'],
    ['temperature -5 C (ice at 1 atm)', withLine('temperature -5 C'), 'from 0 to 100 °C'],
    ['a temperature sweep to 120 C', withLine('sweep temperature from 20 C to 120 C step 10'), 'from 0 to 100 °C'],
    ['total 1e6 mol/L', replacing('total 1 mmol/L', 'total 1e6 mol/L'), 'from 0 to 55 mol/L'],
    ['an H+ deficit of 100 mol/L', replacing('component H+ balance', 'component H+ total -100 mol/L'), 'in size from 0 to 55 mol/L'],
    ['free 60 mol/L', replacing('total 2 mmol/L', 'free 60 mol/L'), 'from 0 to 55 mol/L'],
    ['a total sweep to 100 mol/L', withLine('sweep total Cl- from 1 mmol/L to 100 mol/L points 3'), 'from 0 to 55 mol/L'],
    ['ionic strength 100 mol/L', withLine('ionic-strength 100 mol/L'), 'from 0 to 55 mol/L'],
    ['a partial pressure of 1e5 atm', withLine('component CO2(g) pressure 1e5 atm\nreaction CO2(g) + H2O <=> H2CO3 logKH -1.47 cite "x"'), 'above 0 and up to 100 atm'],
    ['log K 1e300', replacing('logK -7.95', 'logK 1e300'), 'from -150 to 150'],
    ['pKsp 1e3', replacing('pKsp 19.66', 'pKsp 1000'), 'from -150 to 150'],
    ['Ka 1e-200', replacing('logK -7.95', 'K 1e-200'), 'from -150 to 150'],
    ['dH 1e308 kcal/mol (overflows in kJ)', replacing('dH 55.84 kJ/mol', 'dH 1e308 kcal/mol'), 'from -1000 to 1000 kJ/mol'],
    ['dH 5000 kJ/mol', replacing('dH 55.84 kJ/mol', 'dH 5000 kJ/mol'), 'from -1000 to 1000 kJ/mol'],
    ['a total of 1e-305 mol/L (closer to 0 than the solver resolves)', replacing('total 1 mmol/L', 'total 1e-305 mol/L'), 'closer to 0 than 1e-300 mol/L'],
    ['a coefficient of 1e300', replacing('Cu(OH)2(s) <=> Cu^2+ + 2 OH-', 'Cu(OH)2(s) <=> Cu^2+ + 1e300 OH-'), 'from 0.01 to 1000'],
    ['an ion size of 50 Å', withLine('activity debye-huckel\nion-size Cu^2+ 50 Å'), 'above 0 and up to 20 Å'],
  ]
  it.each(cases)('%s', (_, source, range, count = 1) => {
    const { found, model } = only(source, 'P083', count)
    expect(model).toBeNull()
    expect(found.message).toContain(range)
  })
  it('accepts the ends of each range (0 and 100 °C, 373.15 K, pH −2 and 16, 55 mol/L)', () => {
    for (const source of [withLine('temperature 0 C'), withLine('temperature 100 C'), withLine('temperature 373.15 K'),
      replacing('component H+ balance', 'component H+ pH -2'), replacing('component H+ balance', 'component H+ pH 16'),
      replacing('total 2 mmol/L', 'total 55 mol/L')]) {
      expect(compile(source).diagnostics.filter((d) => d.severity === 'error')).toEqual([])
    }
  })
})

describe('outside the usual range, a warning with the range (W106)', () => {
  it.each([
    ['pH 15', replacing('component H+ balance', 'component H+ pH 15'), 'from 0 to 14'],
    ['total 6 mol/L', replacing('total 2 mmol/L', 'total 6 mol/L'), 'to 5 mol/L'],
    ['total 1e-30 mol/L (less than one particle a litre)', replacing('total 2 mmol/L', 'total 1e-30 mol/L'), 'from 1.66054e-24'],
    ['a partial pressure of 5 atm', withLine('component CO2(g) pressure 5 atm\nreaction CO2(g) + H2O <=> H2CO3 logKH -1.47 cite "x"'), 'from 0 to 1 atm'],
    ['log K 80', replacing('logK -7.95', 'logK -80'), 'from -60 to 60'],
    ['a sweep of pH to 15', withLine('sweep pH from 2 to 15 step 1'), 'from 0 to 14'],
  ])('%s', (_, source, range) => {
    const { found, model } = only(source, 'W106')
    expect(found.severity).toBe('warning')
    expect(found.message).toContain(range)
    expect(model).not.toBeNull()
  })
  it('says nothing of a total of exactly 0 (an absent component)', () => {
    expect(compile(replacing('total 2 mmol/L', 'total 0 mmol/L')).diagnostics).toEqual([])
  })
})

describe('sweeps and formulas', () => {
  it('counts sweep points without overflowing into the message', () => {
    const { found } = only(withLine('sweep pH from 2 to 12 step 1e-300'), 'P080')
    expect(found.message).toBe(`this sweep has more than a billion points; it may have 2 to ${SIZE_LIMITS.maxSweepPoints}: use a larger step`)
    expect(only(withLine('sweep pH from 2 to 12 step 0.001'), 'P080').found.message).toContain('this sweep has 10001 points; it may have 2 to 5000')
    expect(only(withLine('sweep pH from 2 to 12 points 1e308'), 'P080').found.message).toBe('points must be a whole number from 2 to 5000, not 1e308')
  })
  it('uses one set of size limits in the language and on the server: the same object', () => {
    expect(SOLVE_LIMITS.size).toBe(SIZE_LIMITS)
    // The checker refuses one point past the limit, the server's check of a model says the same limit.
    expect(only(withLine(`sweep pH from 2 to 12 points ${SIZE_LIMITS.maxSweepPoints + 1}`), 'P080').found.message).toContain(`from 2 to ${SIZE_LIMITS.maxSweepPoints}`)
    expect(compile(withLine(`sweep pH from 2 to 12 points ${SIZE_LIMITS.maxSweepPoints}`)).model!.sweep!.values).toHaveLength(SIZE_LIMITS.maxSweepPoints)
  })
  it('bounds atom counts and charges, so no balance message can overflow', () => {
    expect(only(withLine('component C1001 total 1 mM'), 'P010').found.message).toContain('1 to 1000 atoms')
    expect(only(withLine('component Cl^99- total 1 mM'), 'P010').found.message).toContain('from −20 to +20')
    const big = only(withLine('reaction C1000H1000 + 1000 H2O <=> C1000 + 1000 H+ logK 1 cite "x"'), 'P020').found.message
    expect(big).toContain('more H')
  })
})

describe('formatNumber', () => {
  it('never writes NaN or Infinity', () => {
    fc.assert(fc.property(fc.double(), (x) => { expect(formatNumber(x)).not.toMatch(NON_FINITE) }), { numRuns: 500 })
    expect(formatNumber(1e308)).toBe('1e308')
    expect(formatNumber(0.1 + 0.2)).toBe('0.3')
    expect(formatNumber(-2)).toBe('-2')
  })
  it('states every range in words', () => {
    for (const name of Object.keys(LIMITS) as (keyof typeof LIMITS)[]) expect(rangeText(name)).toMatch(/^(from|above) -?\d/)
  })
})

// Numbers a user might type, and the ones that break arithmetic; sensible
// values most of the time, so that many generated files compile and solve.
const strange = fc.oneof(
  fc.constantFrom('1e308', '-1e308', '1e309', '-1e309', '5e-324', '1e-320', '2.3e-308', '1e-400', '10^400', '10^-400', '0', '-0', '55', '56', '16', '-2', '100', '1e6', '0.001', '7', '14'),
  fc.double({ noNaN: true, noDefaultInfinity: true }).map((x) => String(x)),
  fc.double({ min: -20, max: 120, noNaN: true }).map((x) => String(x)),
)
const literal = (sensible: string) => fc.oneof({ arbitrary: fc.constant(sensible), weight: 3 }, { arbitrary: strange, weight: 1 })

/** Every number anywhere in a value, with its path. */
function numbersIn(value: unknown, path = '$', out: [string, number][] = []): [string, number][] {
  if (typeof value === 'number') out.push([path, value])
  else if (Array.isArray(value)) value.forEach((v, i) => numbersIn(v, `${path}[${i}]`, out))
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) numbersIn(v, `${path}.${k}`, out)
  return out
}

function expectFinite(value: unknown, what: string): void {
  for (const [path, x] of numbersIn(value)) expect(Number.isFinite(x), `${what} ${path} = ${x}`).toBe(true)
  expect(JSON.stringify(value), what).not.toMatch(/NaN|Infinity/)
}

describe('no diagnostic, model or answer ever holds NaN or Infinity', { timeout: 120_000 }, () => {
  it('over generated numbers in every slot of a file', () => {
    let solved = 0
    const slots = fc.record({
      temperature: literal('25'), pH: literal('7'), total: literal('1'), free: literal('2'), ionicStrength: literal('0.01'), logK: literal('-7.95'),
      pKsp: literal('19.66'), dH: literal('55.84'), coefficient: literal('2'), sweepFrom: literal('4'), sweepTo: literal('10'), points: literal('7'), ionSize: literal('4.5'),
      use: fc.record({ temperature: fc.boolean(), pH: fc.boolean(), ionicStrength: fc.boolean(), sweep: fc.boolean(), ionSize: fc.boolean() }),
    })
    fc.assert(fc.property(slots, (n) => {
      const source = [
        'system "Generated numbers"',
        n.use.temperature ? `temperature ${n.temperature} C` : '',
        'activity debye-huckel',
        n.use.ionicStrength ? `ionic-strength ${n.ionicStrength} mol/L` : '',
        n.use.pH ? `component H+ pH ${n.pH}` : 'component H+ balance',
        `component Cu^2+ total ${n.total} mmol/L`,
        `component Cl- free ${n.free} mmol/L`,
        `reaction H2O <=> H+ + OH- pKw 14 dH ${n.dH} kJ/mol cite "x"`,
        `reaction Cu^2+ + H2O <=> CuOH+ + H+ logK ${n.logK} cite "x"`,
        `reaction Cu(OH)2(s) <=> Cu^2+ + ${n.coefficient} OH- pKsp ${n.pKsp} cite "x"`,
        n.use.ionSize ? `ion-size CuOH+ ${n.ionSize} Å` : '',
        n.use.sweep ? `sweep pH from ${n.sweepFrom} to ${n.sweepTo} points ${n.points}` : '',
      ].join('\n')
      const r = compile(source)
      for (const d of r.diagnostics) expect(d.message, source).not.toMatch(NON_FINITE)
      if (!r.model) return
      expectFinite(r.model, 'model')
      const points = r.model.sweep?.values.length ?? 0
      if (points > 12) return
      expectFinite(points ? sweep(r.model) : solve(r.model), `answer to\n${source}\n`)
      solved++
    }), { numRuns: 250, seed: 20261205 })
    // Seeded so that the count below is the same on every run. The property is
    // only worth something when many files got as far as the solver.
    expect(solved).toBeGreaterThan(40)
  })
})
