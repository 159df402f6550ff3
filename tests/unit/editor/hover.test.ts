import { describe, expect, it } from 'vitest'
import { EditorState } from '@codemirror/state'
import { compile } from '../../../shared/poise/index'
import { poiseSymbolsField, setPoiseSymbols } from '../../../codemirror/analysis'
import { constantAt, describeSymbol, findSymbol, symbolAt } from '../../../codemirror/hover'
import { wordAt } from '../../../codemirror/wordHover'
import { lexLine } from '../../../codemirror/language'

const plating = `system "Copper ammine plating bath"
component Cu^2+ total 10 mmol/L
component NH3 total 0.5 mol/L
component H+ balance
reaction H2O <=> H+ + OH- pKw 14.00
reaction NH4+ <=> NH3 + H+ pKa 9.24
reaction Cu^2+ + 4 NH3 <=> Cu(NH3)4^2+ logbeta 13.0
`

/** An editor state holding `plating` with the symbols of its compile, as after the linter ran. */
function compiledState() {
  const result = compile(plating)
  const state = EditorState.create({ doc: plating, extensions: [poiseSymbolsField] })
  return { state: state.update({ effects: setPoiseSymbols.of(result.symbols) }).state, symbols: result.symbols }
}

describe('hover on a species', () => {
  it('shows the ion size debye-huckel takes and where it comes from', () => {
    const symbols = compile(plating.replace('component H+ balance', 'component H+ balance\nactivity debye-huckel\nion-size Cu(NH3)4^2+ 7 Å')).symbols
    expect(describeSymbol(findSymbol(symbols, 'Cu(NH3)4^2+')!).ionSize).toBe('7 Å (given by ion-size in this file; used by activity debye-huckel)')
    expect(describeSymbol(findSymbol(symbols, 'Cu^2+')!).ionSize).toBe('6 Å (built-in table; used by activity debye-huckel)')
    expect(describeSymbol(findSymbol(compile(plating).symbols, 'NH4+')!).ionSize).toContain('built-in table')
    expect(describeSymbol(findSymbol(symbols, 'NH3')!).ionSize).toBeNull()
  })


  it('shows Cu(NH3)4^2+ typeset with the composition and charge its formula gives', () => {
    const { state } = compiledState()
    // Composition and charge follow from the formula itself: Cu(NH3)4 has 1 Cu, 4 N, 12 H; ^2+ is a charge of +2.
    const found = symbolAt(state, plating.indexOf('Cu(NH3)4^2+') + 3)!
    expect(found.description.title).toBe('Cu(NH₃)₄²⁺')
    expect(found.description.composition).toEqual([
      { element: 'Cu', count: 1 },
      { element: 'N', count: 4 },
      { element: 'H', count: 12 },
    ])
    expect(found.description.charge).toBe('+2')
    expect(found.from).toBe(plating.indexOf('Cu(NH3)4^2+'))
  })

  it('gives the molar mass from IUPAC atomic weights and the resolved log10 β', () => {
    const { state } = compiledState()
    const { description } = symbolAt(state, plating.indexOf('Cu(NH3)4^2+'))!
    // IUPAC standard atomic weights (abridged, from memory): Cu 63.546, N 14.007, H 1.008
    // → 63.546 + 4·14.007 + 12·1.008 = 131.670 g/mol.
    expect(parseFloat(description.molarMass)).toBeCloseTo(131.67, 1)
    // The cumulative constant as written in the file: Cu^2+ and NH3 are both components.
    expect(description.formation).toContain('log₁₀ β = 13.00')
  })

  it('calls a component a component, and resolves a species through the reactions', () => {
    const { state, symbols } = compiledState()
    expect(symbolAt(state, plating.indexOf('NH3'))!.description.formation).toMatch(/^a component/)
    // NH4+ = NH3 + H+ with pKa 9.24, so its formation from the components has log10 β = +9.24.
    expect(describeSymbol(findSymbol(symbols, 'NH4+')!).formation).toContain('9.24')
    expect(describeSymbol(findSymbol(symbols, 'OH-')!).charge).toBe('−1')
  })

  it('finds a species written in superscript form', () => {
    const { symbols } = compiledState()
    expect(findSymbol(symbols, 'Cu²⁺')?.name).toBe('Cu^2+')
  })

  it('still tells what a formula is made of when the compile could not define it', () => {
    const broken = plating.replace('component Cu^2+', 'component Cu+2')
    const result = compile(broken)
    let state = EditorState.create({ doc: broken, extensions: [poiseSymbolsField] })
    state = state.update({ effects: setPoiseSymbols.of(result.symbols) }).state
    const { description } = symbolAt(state, broken.indexOf('Cu(NH3)4^2+'))!
    expect(description.kind).toBe('formula')
    expect(description.composition).toEqual([
      { element: 'Cu', count: 1 },
      { element: 'N', count: 4 },
      { element: 'H', count: 12 },
    ])
    expect(description.charge).toBe('+2')
    expect(description.formation).toMatch(/^not resolved/)
  })

  it('names water the solvent', () => {
    const { state } = compiledState()
    expect(symbolAt(state, plating.indexOf('H2O'))!.description.kind).toBe('solvent')
  })

  it('shows nothing over a keyword or a number', () => {
    const { state } = compiledState()
    expect(symbolAt(state, plating.indexOf('total') + 1)).toBeNull()
    expect(symbolAt(state, plating.indexOf('13.0') + 1)).toBeNull()
  })
})

describe('hover on the target of a limit', () => {
  const text = plating + 'sweep pH from 7 to 12 step 0.5\nlimit dissolved Cu 1 mg/L\nlimit dissolved NH3 10 mmol/L\n'
  const result = compile(text)
  const state = EditorState.create({ doc: text, extensions: [poiseSymbolsField] }).update({ effects: setPoiseSymbols.of(result.symbols) }).state

  it('says an element counts its atoms in every dissolved species, by the element\'s weight (Cu 63.546 g/mol, IUPAC 2021)', () => {
    const found = symbolAt(state, text.indexOf('limit dissolved Cu') + 16)!
    expect(found.description.kind).toBe('limit')
    expect(found.description.title).toBe('dissolved Cu')
    expect(found.description.molarMass).toBe('63.546 g/mol (a mass unit counts the element)')
    expect(found.description.formation).toBe('the Cu atoms of Cu²⁺ in every dissolved species; a solid\'s share is not counted')
  })

  it('says a component counts its dissolved total by its formula mass', () => {
    const found = symbolAt(state, text.indexOf('limit dissolved NH3') + 17)!
    expect(found.description.title).toBe('dissolved NH₃')
    expect(found.description.molarMass).toBe('17.031 g/mol (a mass unit counts the whole NH₃)')
  })
})

describe('hover through an abbreviation', () => {
  const citrate = `system "Nickel citrate"
abbreviation Cit = C6H5O7
component H+ balance
component Ni^2+ total 1 mmol/L
component Cit^3- total 2 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
reaction Ni^2+ + Cit^3- <=> NiCit^- logbeta 5.4 cite "from memory"
`
  function stateOf(text: string) {
    const state = EditorState.create({ doc: text, extensions: [poiseSymbolsField] })
    return state.update({ effects: setPoiseSymbols.of(compile(text).symbols) }).state
  }

  it('on the name in its definition: what it stands for and its molar mass', () => {
    const found = symbolAt(stateOf(citrate), citrate.indexOf('Cit ='))!
    expect(found.description.kind).toBe('abbreviation')
    expect(found.description.formation).toContain('stands for C6H5O7')
    // IUPAC abridged atomic weights: 6·12.011 + 5·1.008 + 7·15.999 = 189.099 g/mol.
    expect(found.description.molarMass).toBe('189.099 g/mol')
  })

  it('on a species written with it: the expanded composition, the charge and the abbreviation used', () => {
    const found = symbolAt(stateOf(citrate), citrate.indexOf('NiCit^-') + 2)!
    expect(found.description.kind).toBe('species')
    expect(found.description.composition).toEqual([{ element: 'Ni', count: 1 }, { element: 'C', count: 6 }, { element: 'H', count: 5 }, { element: 'O', count: 7 }])
    expect(found.description.charge).toBe('−1')
    expect(found.description.formation).toContain('log₁₀ β = 5.40')
    expect(found.description.writtenWith).toBe('Cit = C6H5O7')
  })
})

describe('hover on keywords and numbers with units', () => {
  const text = `system "Hover words"
temperature 35 C
component H+ balance
component NH3 total 170.31 mg/L
component Cu^2+ total 1.5 mmol/L
reaction NH4+ <=> NH3 + H+ pKa 9.24 dH 12 kcal/mol cite "from memory"
`
  const state = EditorState.create({ doc: text, extensions: [poiseSymbolsField] })
    .update({ effects: setPoiseSymbols.of(compile(text).symbols) }).state

  it('a statement keyword: its syntax and what it does, from the reference, with the link to it', () => {
    const found = wordAt(state, text.indexOf('component'))!
    expect(found.description.lines[0]).toBe('component FORMULA SPEC')
    expect(found.description.lines[1]).toContain('basis species')
    expect(found.description.link).toBe('/reference#component')
  })

  it('a clause keyword: its row of the statement\'s table', () => {
    const found = wordAt(state, text.indexOf('balance'))!
    expect(found.description.title).toBe('balance')
    expect(wordAt(state, text.indexOf('total'))!.description.title).toBe('total N UNIT')
    expect(found.description.lines[0]).toMatch(/^its total is whatever electroneutrality needs/)
    expect(found.description.link).toBe('/reference#component')
  })

  it('a number with its unit in the model unit; a mass concentration through the molar mass', () => {
    // IUPAC abridged atomic weights: NH3 = 14.007 + 3·1.008 = 17.031 g/mol, so 170.31 mg/L = 10 mmol/L.
    const mass = wordAt(state, text.indexOf('mg/L'))!
    expect(mass.description.title).toBe('170.31 mg/L')
    expect(mass.description.lines[0]).toBe('= 0.01 mol/L of NH3 (17.031 g/mol, IUPAC standard atomic weights)')
    expect(wordAt(state, text.indexOf('1.5 mmol'))!.description.lines).toEqual(['= 0.0015 mol/L'])
    expect(wordAt(state, text.indexOf('35 C'))!.description.lines).toEqual(['= 35 °C', '= 308.15 K'])
    // 1 thermochemical calorie = 4.184 J (definition): 12 kcal/mol = 50.208 kJ/mol.
    expect(wordAt(state, text.indexOf('kcal'))!.description.lines).toEqual(['= 50.208 kJ/mol'])
  })

  it('the kind of a constant says what its number is', () => {
    const line = text.split('\n')[5]!
    const found = constantAt(lexLine(line), line.indexOf('pKa'))!
    expect(found.description.rows).toContainEqual(['kind', 'acid dissociation constant'])
  })
})
