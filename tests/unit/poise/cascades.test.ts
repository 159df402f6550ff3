import { describe, expect, it } from 'vitest'
import { compile, type Diagnostic } from '../../../shared/poise/index'
import { suggestUnits } from '../../../shared/poise/units'

/** A correct file with cumulative constants, so a lost component could turn into wrong advice about logbeta. */
const AMMINE = `system "Copper with ammonia"
component H+ balance
component Cu^2+ total 1 mmol/L
component NH3 total 10 mmol/L
component Cl- total 2 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water (from memory)"
reaction NH4+ <=> NH3 + H+ pKa 9.25 cite "ammonium (from memory)"
reaction Cu^2+ + NH3 <=> CuNH3^2+ logbeta 4.0 cite "ammine (from memory)"
reaction Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+ logbeta 7.5 cite "ammine (from memory)"
reaction CuNH3^2+ + Cl- <=> CuNH3Cl+ logK 0.5 cite "chloro ammine (from memory)"
sweep pH from 3 to 10 step 0.5
`

const replacing = (from: string, to: string) => {
  if (!AMMINE.includes(from)) throw new Error(`test setup: ${from} not in the file`)
  return AMMINE.replace(from, to)
}
const errors = (source: string): Diagnostic[] => compile(source).diagnostics.filter((d) => d.severity === 'error')

describe('one mistake gives one error', () => {
  it('the file without a mistake is clean', () => {
    expect(compile(AMMINE).diagnostics).toEqual([])
  })

  const cases: [string, string, string, string][] = [
    ['a formula with its charge not in caret form', 'component Cu^2+ total', 'component Cu+2 total', 'P012'],
    ['an ambiguous charge', 'component Cu^2+ total', 'component Cu2+ total', 'P012'],
    ['a typo in an element symbol', 'component Cu^2+ total', 'component Cx^2+ total', 'P011'],
    ['an unclosed bracket in a formula', 'component NH3 total', 'component NH(3 total', 'P010'],
    ['a misspelt keyword in a component line', 'component NH3 total 10', 'component NH3 totl 10', 'P002'],
    ['a missing unit', 'total 10 mmol/L', 'total 10', 'P050'],
    ['a number double precision cannot carry in a component line', 'total 10 mmol/L', 'total 1e999 mmol/L', 'P082'],
    ['an unclosed quote in a component line', 'component NH3 total 10 mmol/L', 'component NH3 total 10 mmol/L "', 'P001'],
    ['ppm for a unit', 'total 10 mmol/L', 'total 10 ppm', 'P050'],
    ['a unit with its litre in small letters', 'total 10 mmol/L', 'total 10 mmol/l', 'P050'],
    ['a negative total', 'total 10 mmol/L', 'total -10 mmol/L', 'P052'],
    ['a component with no spec', 'component NH3 total 10 mmol/L', 'component NH3', 'P059'],
    ['a bad charge in a reaction', 'CuNH3^2+ logbeta', 'CuNH3^+2 logbeta', 'P012'],
    ['a typo in a reaction species', 'reaction NH4+ <=> NH3', 'reaction NH4+ <=> NH4', 'P020'],
    ['a constant kind in the wrong case', 'logK 0.5', 'logk 0.5', 'P002'],
    ['a misspelt keyword in the sweep', 'step 0.5', 'stp 0.5', 'P002'],
  ]
  for (const [what, from, to, code] of cases) {
    it(`${what}: exactly one error, ${code}`, () => {
      expect(errors(replacing(from, to)).map((d) => d.code)).toEqual([code])
    })
  }

  it('a broken component line gives no advice to use logK on the reactions that use it', () => {
    const found = errors(replacing('component NH3 total 10 mmol/L', 'component NH3 total 10 mmoll'))
    expect(found.map((d) => d.message).join('\n')).not.toMatch(/stepwise|use logK/)
  })

  it('logbeta on a left side with a species no component line may have meant still gets the advice', () => {
    // The broken line meant Cu^2+; CuNH3^2+ is made by a reaction, so the logbeta check still applies to it.
    const source = replacing('component Cu^2+ total', 'component Cu+2 total') + 'reaction CuNH3^2+ + NH3 <=> Cu(NH3)2^2+ logbeta 3.5 cite "x"\n'
    const found = errors(source)
    expect(found.map((d) => d.code)).toEqual(['P012', 'P040'])
    expect(found[1]!.message).toContain('CuNH3^2+ is not one (use logK for a stepwise constant)')
  })
})

describe('a broken line that other lines refer to', () => {
  const CITED = `system "Cited ammonia"
activity debye-huckel
ion-size CuNH3^2+ 5 Å
source hb "A handbook (from memory)"
component H+ balance
component Cu^2+ total 1 mmol/L
component NH3 total 10 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite hb
reaction NH4+ <=> NH3 + H+ pKa 9.25 cite hb
reaction Cu^2+ + NH3 <=> CuNH3^2+ logbeta 4.0 cite hb
`
  const breaking = (from: string, to: string) => {
    if (!CITED.includes(from)) throw new Error(`test setup: ${from} not in the file`)
    return compile(CITED.replace(from, to)).diagnostics
  }

  it('the file without a mistake has no error', () => {
    expect(compile(CITED).diagnostics.filter((d) => d.severity === 'error')).toEqual([])
  })

  it('a source line with no closing quote: one error, not one on every cite', () => {
    expect(breaking('(from memory)"', '(from memory)').map((d) => d.code)).toEqual(['P001'])
  })

  it('a source line without its key: one error, not one on every cite', () => {
    expect(breaking('source hb "A', 'source "A').map((d) => d.code)).toEqual(['P002'])
  })

  it('a cite of another key than the broken source line names is still reported', () => {
    const source = CITED.replace('(from memory)"', '(from memory)') + 'reaction Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+ logbeta 7.5 cite hx\n'
    expect(compile(source).diagnostics.map((d) => d.code)).toEqual(['P001', 'P034'])
  })

  it('a misspelt activity model: one error, and no warning that ion sizes do nothing "with ideal"', () => {
    const found = breaking('activity debye-huckel', 'activity debye-hukel')
    expect(found.map((d) => d.code)).toEqual(['P002'])
  })
})

describe('a word where a unit goes that is not one', () => {
  const unitError = (source: string) => {
    const found = errors(source)
    expect(found).toHaveLength(1)
    expect(found[0]!.code).toBe('P050')
    return found[0]!
  }
  const fixed = (source: string, d: Diagnostic) => {
    const f = d.fixes![0]!
    return source.slice(0, f.from) + f.insert + source.slice(f.to)
  }

  it('ppm says it is not a unit, why mg/L is meant, and fixes it to mg/L', () => {
    const source = replacing('total 10 mmol/L', 'total 170 ppm')
    const d = unitError(source)
    expect(d.message).toBe("ppm is not a unit: ppm is the trade's shorthand for mg/L in dilute water, so write mg/L")
    expect(source.slice(d.range.from, d.range.to)).toBe('ppm')
    expect(d.fixes).toEqual([{ label: 'write mg/L', from: d.range.from, to: d.range.to, insert: 'mg/L' }])
    expect(compile(fixed(source, d)).diagnostics).toEqual([])
  })

  it('ppb offers µg/L', () => {
    const d = unitError(replacing('component Cu^2+ total 1 mmol/L', 'component Cu^2+ total 50 ppb'))
    expect(d.message).toContain('ppb is not a unit')
    expect(d.message).toContain("the trade's shorthand for µg/L")
    expect(d.fixes?.map((f) => f.insert)).toEqual(['µg/L'])
  })

  it('mg/l is one error over the whole word (not one for the word and one for the slash), fixed to mg/L', () => {
    const source = replacing('total 10 mmol/L', 'total 170 mg/l')
    const d = unitError(source)
    expect(source.slice(d.range.from, d.range.to)).toBe('mg/l')
    expect(d.message).toBe('mg/l is not a unit: write mg/L')
    expect(compile(fixed(source, d)).diagnostics).toEqual([])
  })

  it('a unit without its litre (mmol) is offered the concentration it begins', () => {
    const source = replacing('total 10 mmol/L', 'total 10 mmol')
    const d = unitError(source)
    expect(d.message).toBe('mmol is not a unit: write mmol/L')
    expect(compile(fixed(source, d)).diagnostics).toEqual([])
  })

  it('a misspelt unit is offered the nearest one; in an enthalpy too', () => {
    const source = replacing('pKw 14.00', 'pKw 14.00 dH 55.8 kJ/mool')
    const d = unitError(source)
    expect(d.message).toBe('kJ/mool is not a unit: write kJ/mol')
    expect(compile(fixed(source, d)).diagnostics).toEqual([])
  })

  it('a word as near to two units offers both and no quick fix', () => {
    const d = unitError(replacing('total 10 mmol/L', 'total 10 mn'))
    // After `total`, the concentrations one letter away (mL is one too, but a volume).
    expect(d.message).toBe('mn is not a unit: did you mean M or mM?')
    expect(d.fixes).toBeUndefined()
  })

  it('the nearest units are those of the quantity the statement gives', () => {
    // F is one letter from M, C and K; after `temperature` only the temperatures are meant.
    const d = unitError(replacing('sweep pH', 'temperature 35 F\nsweep pH'))
    expect(d.message).toBe('F is not a unit: did you mean C or K?')
    expect(suggestUnits('F').units).toEqual(['M', 'C', 'K'])
    // Within the quantity, the nearest one is the fix when no other is as near.
    expect(suggestUnits('J/mo', ['enthalpy'])).toMatchObject({ units: ['J/mol', 'kJ/mol'], clear: true })
  })

  it('a misspelt keyword after a number stays a syntax error, not a unit', () => {
    const found = errors(replacing('logK 0.5 cite', 'logK 0.5 cit'))
    expect(found.map((d) => d.code)).toEqual(['P002'])
  })

  it('suggestions come from the units module, in one spelling of micro', () => {
    expect(suggestUnits('umol/l').units).toEqual(['µmol/L'])
    expect(suggestUnits('ppm')).toMatchObject({ units: ['mg/L'], clear: true })
    expect(suggestUnits('kpa').units).toEqual(['kPa'])
    // Two units one edit away: both offered, neither as a quick fix.
    const near = suggestUnits('mn')
    expect(near.units.length).toBeGreaterThan(1)
    expect(near.clear).toBe(false)
  })
})

describe('every recovered syntax error of a line is reported', () => {
  it('two separate mistakes on one line give two errors', () => {
    const source = AMMINE + 'reaction Cu^2+ + + Cl- <=> CuCl+ logK 0.4 cite\n'
    const found = errors(source).filter((d) => d.range.line === 12)
    expect(found.map((d) => d.code)).toEqual(['P002', 'P002'])
    expect(found[0]!.message).toContain("found '+'")
    expect(found[1]!.message).toContain("after 'cite', found the end of the line")
  })

  it('an error the parser only echoes at the next token is not repeated', () => {
    const source = AMMINE + 'reaction Cu^2+ Cl- <=> CuCl+ logK 0.4 cite "x" 7\n'
    const found = errors(source).filter((d) => d.range.line === 12)
    expect(found.map((d) => d.message)).toEqual([
      "expected <=> after 'Cu^2+', found 'Cl-'",
      "unexpected '7': one statement a line, and nothing after its end (comments start with #)",
    ])
  })
})
