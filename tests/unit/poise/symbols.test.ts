import { describe, expect, it } from 'vitest'
import { compile, KEYWORDS, UNITS, CONSTANT_KINDS } from '../../../shared/poise/index'
import { CLEAN } from './helpers'
import { lexForParser } from '../../../shared/poise/lexer'
import { UNIT_SPELLINGS, UNITS_AFTER_NUMBER_ONLY, unitInfo } from '../../../shared/poise/units'
import { KINDS_AFTER_FORMULA_ONLY } from '../../../shared/poise/model'

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

  it('reads every unit of the unit table after a number, and only those not reserved for that anywhere', () => {
    for (const unit of UNIT_SPELLINGS) {
      const afterNumber = lexForParser(`2 ${unit}\n`).tokens.map((t) => [t.tokenType.name, t.image])
      expect(afterNumber[1], unit).toEqual(['Unit', unit])
      expect(unitInfo(unit), unit).not.toBeNull()
      const alone = lexForParser(`${unit}\n`).tokens[0]!
      expect(alone.tokenType.name === 'Unit', unit).toBe(!UNITS_AFTER_NUMBER_ONLY.has(unit))
    }
  })

  it('reads every constant kind after the last species of a reaction, the short ones only there', () => {
    for (const kind of CONSTANT_KINDS) {
      const tokens = lexForParser(`reaction A <=> B ${kind} 2\n`).tokens
      expect(tokens.find((t) => t.image === kind)?.tokenType.name, kind).toBe('ConstantKind')
      const alone = lexForParser(`${kind} 2\n`).tokens[0]!
      expect(alone.tokenType.name === 'ConstantKind', kind).toBe(!KINDS_AFTER_FORMULA_ONLY.has(kind as never))
    }
  })
})
