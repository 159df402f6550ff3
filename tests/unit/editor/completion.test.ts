import { describe, expect, it } from 'vitest'
import { EditorState } from '@codemirror/state'
import type { PoiseSymbol } from '../../../shared/poise/index'
import { poiseSymbolsField, setPoiseSymbols } from '../../../codemirror/analysis'
import { completionsAt } from '../../../codemirror/completion'
import { compile } from '../../../shared/poise/index'

const range = { from: 0, to: 0, line: 1, column: 1, endLine: 1, endColumn: 1 }
const symbol = (name: string, kind: PoiseSymbol['kind'], charge = 0): PoiseSymbol => ({
  name, kind, elements: {}, charge, molarMass: 0, logK: kind === 'component' ? 0 : 1, definedAt: range,
  ionSize: charge === 0 ? null : { angstrom: 5, source: 'charge' },
})
/** What the last compile of a copper–ammonia file would have declared. */
const declared = [symbol('Cu^2+', 'component', 2), symbol('NH3', 'component'), symbol('CuNH3^2+', 'species', 2), symbol('Cu(OH)2(s)', 'solid')]

/** Labels offered with the cursor at `|` in `text`. */
function offered(text: string, explicit = false): string[] | null {
  const pos = text.indexOf('|')
  const doc = text.replace('|', '')
  let state = EditorState.create({ doc, extensions: [poiseSymbolsField] })
  state = state.update({ effects: setPoiseSymbols.of(declared) }).state
  const result = completionsAt(state, pos, explicit)
  return result ? result.options.map((o) => o.label) : null
}

describe('Poise completion', () => {
  it('offers the units of the quantity after a number', () => {
    const labels = offered('component NH3 total 120 |')!
    expect(labels).toContain('mmol/L')
    expect(labels).toContain('mg/L')
    expect(labels).not.toContain('atm')
    expect(labels).not.toContain('logK')
    expect(offered('component CO2(g) pressure 0.0004 |')).toEqual(['atm', 'bar', 'kPa', 'Pa'])
    expect(offered('temperature 35 |')!.sort()).toEqual(['C', 'K', '°C'].sort())
  })

  it('offers units while one is being typed, replacing the typed part', () => {
    const doc = 'component NH3 total 120 mm'
    const state = EditorState.create({ doc, extensions: [poiseSymbolsField] })
    const result = completionsAt(state, doc.length, false)!
    expect(result.from).toBe(doc.length - 2)
    expect(result.options.map((o) => o.label)).toContain('mmol/L')
  })

  it('offers constant kinds after the last species of a reaction', () => {
    // Only the kinds the checker accepts for this reaction: a formation from components, no acid, no solid, no gas.
    const labels = offered('reaction Cu^2+ + NH3 <=> CuNH3^2+ |')!
    expect(labels).toEqual(['logK', 'K', 'pK', 'logbeta', 'beta'])
    expect(offered('reaction NH4+ <=> NH3 + H+ |')).toEqual(['logK', 'K', 'pK', 'pKa', 'Ka'])
    expect(offered('reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH- |')).toEqual(['logK', 'K', 'pK', 'pKsp', 'Ksp', 'logKsp'])
    expect(offered('reaction H2O <=> H+ + OH- |')).toEqual(['logK', 'K', 'pK', 'pKa', 'Ka', 'pKw'])
    expect(offered('reaction CO2(g) + H2O <=> H2CO3 |')).toEqual(['logK', 'K', 'pK', 'logKH'])
  })

  it('offers no constant kind on the left of the arrow', () => {
    expect(offered('reaction Cu^2+ |')).toBeNull()
  })

  it('offers the declared species after + and after the arrow', () => {
    expect(offered('reaction Cu^2+ + |')).toEqual(['Cu^2+', 'NH3', 'CuNH3^2+', 'Cu(OH)2(s)'])
    expect(offered('reaction Cu(OH)2(s) <=> C|')).toContain('Cu^2+')
  })

  it('reads a number before a species as a coefficient, not a quantity with a unit', () => {
    const labels = offered('reaction Cu^2+ + 2 |')!
    expect(labels).toContain('NH3')
    expect(labels).not.toContain('mmol/L')
  })

  it('offers enthalpy units after dH and the tail keywords after the constant', () => {
    expect(offered('reaction NH4+ <=> NH3 + H+ pKa 9.24 dH 52.2 |')!.sort()).toEqual(['J/mol', 'kJ/mol', 'kcal/mol'])
    expect(offered('reaction NH4+ <=> NH3 + H+ pKa 9.24 |')).toEqual(['±', '+-', 'dH', 'cite', 'fit'])
  })

  it('offers draws and seed in `uncertainty draws N seed S`', () => {
    expect(offered('unc|')).toContain('uncertainty')
    expect(offered('uncertainty |')).toEqual(['draws'])
    expect(offered('uncertainty draws 200 |')).toEqual(['seed'])
    expect(offered('uncertainty draws 200 seed 7 |')).toBeNull()
  })

  it('offers the uncertainty only right after the value, and each clause once', () => {
    expect(offered('reaction NH4+ <=> NH3 + H+ pKa 9.24 ± 0.05 |')).toEqual(['dH', 'cite', 'fit'])
    expect(offered('reaction NH4+ <=> NH3 + H+ pKa 9.24 +- 0.05 fit |')).toEqual(['dH', 'cite'])
    expect(offered('reaction NH4+ <=> NH3 + H+ pKa 9.24 fit cite "x" |')).toEqual(['dH'])
    expect(offered('reaction NH4+ <=> NH3 + H+ pKa 9.24 dH 52.2 kJ/mol |')).toEqual(['cite', 'fit'])
    // After `cite` comes its text, not another clause.
    expect(offered('reaction NH4+ <=> NH3 + H+ pKa 9.24 cite |')).toBeNull()
  })

  it('offers statement words at the start of a line and specifications after a component', () => {
    const start = offered('|', true)!
    expect(start).toContain('component')
    expect(start).not.toContain('total')
    expect(offered('component Cu^2+ |')).toEqual(['total', 'free', 'pH', 'pressure', 'balance', 'excess'])
  })

  it('offers activity models and only solids after `solid`', () => {
    expect(offered('activity d|')).toEqual(['ideal', 'davies', 'debye-huckel'])
    expect(offered('solid |')).toEqual(['Cu(OH)2(s)'])
  })

  it('offers no unit where the quantity has none', () => {
    expect(offered('component H+ pH 4.5 |')).toBeNull()
    expect(offered('use "buffers" @ 2 |')).toBeNull()
    expect(offered('sweep pH from 6 |')).toEqual(['to'])
    expect(offered('sweep total NH3 from 1 |')).toContain('mmol/L')
  })

  it('offers charged species after `ion-size`, then length units after its number', () => {
    expect(offered('|', true)).toContain('ion-size')
    expect(offered('ion-size |')).toEqual(['Cu^2+', 'CuNH3^2+'])
    expect(offered('ion-size Cu^2+ 6 |')).toEqual(['Å', 'pm', 'nm'])
    expect(offered('ion-size Cu^2+ 6 Å |')).toBeNull()
  })

  it('offers nothing inside a comment', () => {
    expect(offered('# total 12 |')).toBeNull()
  })
})

describe('Poise completion of a titration', () => {
  it('offers volume after sample, then volume units only', () => {
    expect(offered('sample |')).toEqual(['volume'])
    // One spelling of micro in the list; typing u finds the u spelling.
    expect(offered('sample volume 25 |')).toEqual(['mL', 'µL', 'L'])
    expect(offered('sample volume 25 u|')).toEqual(['mL', 'uL', 'L'])
  })

  it('offers components and species after titrant, then concentration units', () => {
    expect(offered('titrant |')).toEqual(['Cu^2+', 'NH3', 'CuNH3^2+'])
    const units = offered('titrant NH3 0.1 |')!
    expect(units).toContain('mol/L')
    expect(units).toContain('mg/L')
    expect(units).not.toContain('mL')
  })

  it('offers from or to after titrate, pH after to, volume units after a volume and the spacing words after it', () => {
    expect(offered('titrate |')).toEqual(['from', 'to'])
    expect(offered('titrate to |')).toEqual(['pH'])
    expect(offered('titrate to pH 7 |')).toBeNull()
    expect(offered('titrate from 0 to 40 |')).toContain('mL')
    expect(offered('titrate from 0 to 40 mL |')).toEqual(['step', 'points'])
    expect(offered('titrate from 0 |')).toEqual(expect.arrayContaining(['mL', 'to']))
    expect(offered('titrate from 0 to 40 mL points 81 |')).toBeNull()
  })

  it('offers the titration statements at the start of a line', () => {
    expect(offered('|', true)).toEqual(expect.arrayContaining(['sample', 'titrant', 'titrate']))
  })
})

describe('Poise completion with the symbols of a real compile', () => {
  it('offers the species the file declares, components and reaction products alike', () => {
    const doc = `system "Limestone bed"
component Ca^2+ total 1 mmol/L
component CO3^2- total 1 mmol/L
component H+ balance
reaction H2O <=> H+ + OH- pKw 14.00
reaction HCO3- <=> CO3^2- + H+ pKa 10.33
reaction `
    let state = EditorState.create({ doc, extensions: [poiseSymbolsField] })
    state = state.update({ effects: setPoiseSymbols.of(compile(doc).symbols) }).state
    const labels = completionsAt(state, doc.length, false)!.options.map((o) => o.label)
    expect(labels).toEqual(expect.arrayContaining(['Ca^2+', 'CO3^2-', 'H+', 'OH-', 'HCO3-']))
  })

  it('completes a limit: dissolved, then an element a component holds or a component, then a concentration unit', () => {
    expect(offered('lim|')).toContain('limit')
    expect(offered('limit |')).toEqual(['dissolved'])
    const state = EditorState.create({ doc: 'limit dissolved ', extensions: [poiseSymbolsField] })
      .update({ effects: setPoiseSymbols.of(compile('system "t"\ncomponent H+ pH 7\ncomponent Ni^2+ total 1 mmol/L\ncomponent SO4^2- total 1 mmol/L\n').symbols) }).state
    expect(completionsAt(state, 16, true)!.options.map((o) => o.label)).toEqual(['Ni', 'S', 'Ni^2+', 'SO4^2-'])
    const units = offered('limit dissolved Ni 1 |')!
    expect(units).toContain('mg/L')
    expect(units).toContain('µmol/L')
    expect(units).not.toContain('atm')
  })
})


describe('Poise completion from the parser, per context', () => {
  /** The options offered at `|` in a whole document, with the symbols of its own compile. */
  function options(text: string, explicit = true) {
    const pos = text.indexOf('|')
    const doc = text.replace('|', '')
    const state = EditorState.create({ doc, extensions: [poiseSymbolsField] })
      .update({ effects: setPoiseSymbols.of(compile(doc).symbols) }).state
    return completionsAt(state, pos, explicit)?.options ?? null
  }

  it('accepting a keyword types the space before what follows it, and none after a last word', () => {
    const start = options('|')!
    expect(start.find((o) => o.label === 'component')!.apply).toBe('component ')
    expect(start.find((o) => o.label === 'abbreviation')!.apply).toBe('abbreviation ')
    const specs = options('component Cu^2+ |')!
    expect(specs.find((o) => o.label === 'total')!.apply).toBe('total ')
    // Nothing can follow balance or excess: no space.
    expect(specs.find((o) => o.label === 'balance')!.apply).toBeUndefined()
    expect(options('activity |')!.find((o) => o.label === 'davies')!.apply).toBeUndefined()
    // A constant kind is always followed by its number.
    expect(options('reaction NH4+ <=> NH3 + H+ |')!.find((o) => o.label === 'pKa')!.apply).toBe('pKa ')
    // A unit ends a quantity: no space.
    expect(options('component NH3 total 1 |')!.find((o) => o.label === 'mmol/L')!.apply).toBeUndefined()
  })

  it('after component: the formulas the reactions use that no component line declares', () => {
    const doc = 'system "t"\ncomponent Ca^2+ total 1 mmol/L\nreaction HCO3- <=> CO3^2- + H+ pKa 10.33 cite "from memory"\nreaction H2O <=> H+ + OH- pKw 14 cite "from memory"\ncomponent |'
    expect(options(doc)!.map((o) => o.label)).toEqual(['HCO3-', 'CO3^2-', 'H+', 'OH-'])
    // Once H+ and CO3^2- are components, the reactions define HCO3- and OH-: nothing is left to declare.
    const declared = doc.replace('component |', 'component H+ balance\ncomponent CO3^2- total 1 mmol/L\ncomponent |')
    expect(options(declared)).toBeNull()
  })

  it('after component: the file\'s abbreviations, to write a ligand with', () => {
    const offered = options('system "t"\nabbreviation Cit = C6H5O7\ncomponent |')!
    expect(offered.map((o) => [o.label, o.detail])).toEqual([['Cit', 'abbreviation: C6H5O7']])
  })

  it('one µ in the unit lists, each unit once', () => {
    const labels = options('component NH3 total 1 |')!.map((o) => o.label)
    expect(labels).toContain('µmol/L')
    expect(labels).toContain('µg/L')
    expect(labels.filter((l) => /^[uμ]/.test(l))).toEqual([])
    expect(new Set(labels).size).toBe(labels.length)
    expect(options('sample volume 25 |')!.map((o) => o.label)).toEqual(['mL', 'µL', 'L'])
  })

  it('after cite: the source keys the file declares', () => {
    const doc = 'system "t"\nsource hb "a handbook"\nsource memory "from memory"\nreaction NH4+ <=> NH3 + H+ pKa 9.24 cite |'
    expect(options(doc)!.map((o) => o.label)).toEqual(['hb', 'memory'])
  })

  it('after sweep total or pressure: only the components given that way', () => {
    const doc = 'system "t"\ncomponent H+ balance\ncomponent CO2(g) pressure 1 atm\ncomponent Na+ total 1 mmol/L\nsweep pressure |'
    expect(options(doc)!.map((o) => o.label)).toEqual(['CO2(g)'])
  })

  it('offers nothing the parser would refuse: no unit after a coefficient, no second statement', () => {
    const coefficient = options('system "t"\ncomponent Cu^2+ total 1 mmol/L\ncomponent NH3 total 1 mmol/L\nreaction Cu^2+ + 2 |')!.map((o) => o.label)
    expect(coefficient).toContain('NH3')
    expect(coefficient).not.toContain('mmol/L')
    expect(options('temperature 25 C |')).toBeNull()
    expect(options('system "a" |')).toBeNull()
  })
})
