import { describe, expect, it } from 'vitest'
import { compile, KEYWORDS, UNITS, CONSTANT_KINDS } from '../../../shared/poise/index'
import { CLEAN } from './helpers'

describe('symbols for completion and hover', () => {
  const r = compile(CLEAN)
  it('lists components and defined species, solids with kind, charge and resolved logK', () => {
    const byName = new Map(r.symbols.map((s) => [s.name, s]))
    expect(byName.get('Cu^2+')).toMatchObject({ kind: 'component', charge: 2, logK: 0 })
    expect(byName.get('OH-')).toMatchObject({ kind: 'species', charge: -1 })
    expect(byName.get('OH-')!.logK).toBeCloseTo(-14, 12)
    // Cu(OH)2(s) <=> Cu^2+ + 2 OH- pKsp 19.66 with pKw 14: formation from Cu^2+ and H+ has logK 19.66 − 28.
    expect(byName.get('Cu(OH)2(s)')!.kind).toBe('solid')
    expect(byName.get('Cu(OH)2(s)')!.logK).toBeCloseTo(-8.34, 12)
    expect(byName.get('CuOH+')!.definedAt.line).toBe(6)
  })
  it('still gives symbols when the file has errors', () => {
    const broken = compile(CLEAN + 'component Ca+2 total 1 mM\n')
    expect(broken.model).toBeNull()
    expect(broken.symbols.map((s) => s.name)).toContain('CuOH+')
  })
  it('exports the words completion offers', () => {
    expect(KEYWORDS).toEqual(expect.arrayContaining(['component', 'reaction', 'debye-huckel', 'pH', 'dH']))
    expect(UNITS).toEqual(expect.arrayContaining(['mmol/L', 'mg/L', 'atm', 'kJ/mol', 'K']))
    expect(CONSTANT_KINDS).toEqual(expect.arrayContaining(['pKa', 'logbeta', 'pKsp', 'logKH', 'pKw']))
  })
})
