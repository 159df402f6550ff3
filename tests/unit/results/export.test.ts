import { describe, expect, it } from 'vitest'
import { csvField, csvLines, csvNumber, jsonExport, resultCsv, safeFileName, sweepCsv } from '../../../shared/results/export'
import { carbonateSweep, copperAmmoniaResult } from './fixtures'
import { parseCsv } from './csvParse'
import { unitScale, type UnitModel } from '../../../shared/results/units'

describe('CSV quoting (RFC 4180)', () => {
  it('quotes fields with commas, quotes and line breaks, and doubles inner quotes', () => {
    expect(csvField('plain')).toBe('plain')
    expect(csvField('a,b')).toBe('"a,b"')
    expect(csvField('say "hi"')).toBe('"say ""hi"""')
    expect(csvField('two\nlines')).toBe('"two\nlines"')
  })

  it('reads back exactly what was written, awkward text included', () => {
    const rows = [
      ['name', 'note'],
      ['Cu(NH3)4^2+', 'a "deep blue", complex'],
      ['x', 'line one\r\nline two'],
    ]
    expect(parseCsv(csvLines(rows))).toEqual(rows)
  })
})

describe('resultCsv', () => {
  const result = copperAmmoniaResult()
  const rows = parseCsv(resultCsv(result))

  it('has one header with a unit column and the same number of fields on every line', () => {
    expect(rows[0]).toEqual(['section', 'name', 'quantity', 'value', 'unit'])
    expect(rows.every((r) => r.length === 5)).toBe(true)
  })

  it('writes five rows a species, and concentrations in full precision with their unit', () => {
    const species = rows.filter((r) => r[0] === 'species')
    expect(species.length).toBe(result.species.length * 5)
    for (const s of result.species) {
      const row = species.find((r) => r[1] === s.name && r[2] === 'concentration')!
      expect(Number(row[3])).toBe(s.concentration)
      expect(row[4]).toBe('mol/L')
    }
  })

  it('writes the conditions and the components', () => {
    const pH = rows.find((r) => r[0] === 'conditions' && r[2] === 'pH')!
    expect(Number(pH[3])).toBe(result.pH)
    const cu = rows.find((r) => r[0] === 'component' && r[1] === 'Cu^2+' && r[2] === 'total')!
    expect(Number(cu[3])).toBe(result.components[1].total)
  })

  it('writes a failed run with its reason, quoted when it holds a comma', () => {
    const failed = { ...result, converged: false, reason: 'mass balance of NH3 did not close, last residual 0.2' }
    const back = parseCsv(resultCsv(failed))
    expect(back.find((r) => r[2] === 'converged')![3]).toBe('false')
    expect(back.find((r) => r[2] === 'reason')![3]).toBe(failed.reason)
  })

  it('writes a value that does not exist as an empty cell with a row saying why, never a stand-in number', () => {
    const absent = {
      ...result,
      species: result.species.map((s) => (s.name === 'Cu^2+' ? { ...s, concentration: 0, activity: 0, log10: null, none: 'none: the total of Cu^2+ is 0' } : s)),
      solids: [{ name: 'Cu(OH)2(s)', present: false, amount: 0, precipitated: 0, saturationIndex: null, none: 'none: the total of Cu^2+ is 0' }],
    }
    const back = parseCsv(resultCsv(absent))
    expect(back.find((r) => r[1] === 'Cu^2+' && r[2] === 'log10 concentration')![3]).toBe('')
    expect(back.find((r) => r[1] === 'Cu^2+' && r[2] === 'none')![3]).toBe('none: the total of Cu^2+ is 0')
    expect(back.find((r) => r[1] === 'Cu(OH)2(s)' && r[2] === 'saturation index')![3]).toBe('')
    expect(back.find((r) => r[1] === 'Cu(OH)2(s)' && r[2] === 'precipitated')![3]).toBe('0')
  })
})

describe('sweepCsv', () => {
  const sweep = carbonateSweep()
  const rows = parseCsv(sweepCsv(sweep))

  it('has a header with units and one row a point', () => {
    expect(rows[0].slice(0, 4)).toEqual(['swept pH', 'converged', 'pH', 'ionic strength (mol/L)'])
    expect(rows[0]).toContain('HCO3- (mol/L)')
    expect(rows.length).toBe(sweep.values.length + 1)
  })

  it('round-trips every concentration through parsing', () => {
    const column = rows[0].indexOf('H2CO3 (mol/L)')
    sweep.points.forEach((p, k) => {
      if (!p.converged) return
      expect(Number(rows[k + 1][column])).toBe(p.species.find((s) => s.name === 'H2CO3')!.concentration)
    })
  })

  it('has one column for each component\'s dissolved total, named apart from the free ion', () => {
    const column = rows[0].indexOf('dissolved CO3 (mol/L)')
    expect(column).toBeGreaterThan(rows[0].indexOf('CO3^2- (mol/L)'))
    expect(rows[0].some((h) => h.startsWith('dissolved H '))).toBe(false)
    sweep.points.forEach((p, k) => {
      if (!p.converged) return
      expect(Number(rows[k + 1][column])).toBe(p.components.find((c) => c.name === 'CO3^2-')!.dissolved)
    })
  })

  it('writes concentrations in the unit chosen, named in the headers', () => {
    const milli = parseCsv(sweepCsv(sweep, unitScale(null, { unit: 'mmol/L', asElement: false })))
    const column = milli[0].indexOf('HCO3- (mmol/L)')
    const dissolved = milli[0].indexOf('dissolved CO3 (mmol/L)')
    expect(column).toBeGreaterThan(0)
    expect(Number(milli[1][column])).toBeCloseTo(sweep.points[0].species.find((s) => s.name === 'HCO3-')!.concentration * 1000, 15)
    expect(Number(milli[1][dissolved])).toBeCloseTo(2, 12)
    // Carbonate as C: 2 mmol/L × 12.011 g/mol (IUPAC, Standard atomic weights 2021) = 24.022 mg/L.
    const model: UnitModel = { components: [{ name: 'H+', elements: { H: 1 } }, { name: 'CO3^2-', elements: { C: 1, O: 3 } }], species: [] }
    const asC = parseCsv(sweepCsv(sweep, unitScale(model, { unit: 'mg/L', asElement: true })))
    const c = asC[0].indexOf('dissolved CO3 (mg/L as C)')
    expect(Number(asC[1][c])).toBeCloseTo(24.022, 9)
  })

  it('keeps a failed point as a row with empty numbers and the reason', () => {
    const k = sweep.values.indexOf(9)
    const row = rows[k + 1]
    expect(row[0]).toBe('9')
    expect(row[1]).toBe('false')
    expect(row.slice(2, -1).every((cell) => cell === '')).toBe(true)
    expect(row.at(-1)).toBe('mass balance of CO3^2- did not close')
  })
})

describe('numbers and names', () => {
  it('writes NaN as an empty cell and infinities so Number() reads them back', () => {
    expect(csvNumber(Number.NaN)).toBe('')
    expect(Number(csvNumber(-Infinity))).toBe(-Infinity)
    expect(Number(csvNumber(1.2345678901234567e-9))).toBe(1.2345678901234567e-9)
  })

  it('exports JSON as it is', () => {
    const result = copperAmmoniaResult()
    expect(JSON.parse(jsonExport(result))).toEqual(result)
  })

  it('makes a safe file name from a title', () => {
    expect(safeFileName('Rinse tank / Cu·NH3, rev 4')).toBe('Rinse-tank-Cu-NH3-rev-4')
    expect(safeFileName('///')).toBe('equipoise-result')
  })
})
