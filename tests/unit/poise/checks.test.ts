import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { CLEAN, codes } from './helpers'

/** CLEAN with one line replaced or added: each case triggers exactly the check it names. */
const withLine = (line: string) => CLEAN + line + '\n'
const replacing = (from: string, to: string) => {
  if (!CLEAN.includes(from)) throw new Error(`test setup: ${from} not in CLEAN`)
  return CLEAN.replace(from, to)
}

describe('a correct file', () => {
  it('has no diagnostics and a model', () => {
    const r = compile(CLEAN)
    expect(r.diagnostics).toEqual([])
    expect(r.model).not.toBeNull()
  })
})

describe('every check is triggered by a file that breaks it', () => {
  const cases: [string, string, string][] = [
    ['P001', 'an unexpected character', withLine('component Na+ total 1 mmol/L $')],
    ['P001', 'an unclosed string', withLine('source x "no end')],
    ['P002', 'a statement that does not parse', withLine('frobnicate 3')],
    ['P002', 'a missing constant', withLine('reaction Cu^2+ + Cl- <=> CuCl+')],
    ['P003', 'no system statement', CLEAN.replace(/^system .*\n/, '')],
    ['P003', 'system not first', CLEAN.replace(/^(system .*\n)(component H\+ balance\n)/, '$2$1')],
    ['P004', 'a statement given twice', withLine('temperature 25 C\ntemperature 30 C')],
    ['P010', 'a formula that does not parse', withLine('component Cu(NH3 total 1 mM')],
    ['P011', 'an unknown element', withLine('component Xq+ total 1 mM')],
    ['P012', 'a wrong charge notation', withLine('component Ca+2 total 1 mM')],
    ['P020', 'an element imbalance', withLine('reaction Cu^2+ + 2 H2O <=> Cu(OH)2 + H+ logK -16 cite "x"')],
    ['P021', 'a charge imbalance', withLine('reaction Cu^2+ + Cl- <=> CuCl logK 0.4 cite "x"')],
    ['P030', 'a name used but never defined', withLine('reaction Cu^2+ + NH3 <=> CuNH3^2+ logK 4 cite "x"\nreaction Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+ logK 7.5 cite "x"')],
    ['P031', 'a component declared twice', withLine('component Cu^2+ total 2 mmol/L')],
    ['P031', 'a species defined twice', withLine('reaction CuOH+ + H+ <=> Cu^2+ + H2O logK 7.95 cite "x"')],
    ['P032', 'a reaction with no new species', withLine('reaction Cu(OH)2(s) + H+ <=> CuOH+ + H2O logK 0 cite "x"')],
    ['P033', 'a reaction with two new species', withLine('reaction Cu^2+ + SO4^2- <=> CuSO4 logK 2.3 cite "x"')],
    ['P034', 'a cite key with no source', replacing('cite "hydrolysis (from memory)"', 'cite nowhere')],
    ['P040', 'pKa on a reaction that releases no H+', withLine('reaction Cu^2+ + Cl- <=> CuCl+ pKa 0.4 cite "x"')],
    ['P040', 'pKsp without a solid on the left', withLine('reaction CuCl+ <=> Cu^2+ + Cl- pKsp 0.4 cite "x"')],
    ['P040', 'pKw on another reaction', replacing('logK -7.95', 'pKw 7.95')],
    ['P040', 'logbeta with a non-component on the left', withLine('reaction CuOH+ + OH- <=> Cu(OH)2 logbeta 6 cite "x"')],
    ['P040', 'logKH without a gas', withLine('reaction CuOH+ + OH- <=> Cu(OH)2 logKH 6 cite "x"')],
    ['P041', 'a K that is not positive', replacing('logK -7.95', 'K 0')],
    ['P050', 'a unit of the wrong dimension', replacing('total 1 mmol/L', 'total 5 atm')],
    ['P050', 'a missing unit', replacing('total 1 mmol/L', 'total 5')],
    ['P050', 'a dH without an enthalpy unit', replacing('dH 55.84 kJ/mol', 'dH 55.84 mM')],
    ['P051', 'a mass unit with no molar mass', withLine('component TcO4- total 1 mg/L')],
    ['P052', 'a negative total', replacing('total 2 mmol/L', 'total -2 mmol/L')],
    ['P053', 'pH on anything but H+', replacing('component Cu^2+ total 1 mmol/L', 'component Cu^2+ pH 5')],
    ['P054', 'pressure on anything but a gas', replacing('component Cl- total 2 mmol/L', 'component Cl- pressure 1 atm')],
    ['P055', 'two balance components', replacing('component Cl- total 2 mmol/L', 'component Cl- balance')],
    ['P056', 'excess on a non-solid', replacing('component Cl- total 2 mmol/L', 'component Cl- excess')],
    ['P057', 'water as a component', withLine('component H2O total 55 mol/L')],
    ['P058', 'balance on an uncharged component', replacing('component H+ balance', 'component H+ pH 7\ncomponent NH3 balance')],
    ['P059', 'a component with no spec', withLine('component Na+')],
    ['P060', 'a component a reaction relates to the others', withLine('component OH- total 1 mmol/L')],
    ['P061', 'an ion size for a species not in the system', withLine('activity debye-huckel\nion-size Zn^2+ 6 Å')],
    ['P070', 'use with no library store', withLine('use "acids"')],
    ['P080', 'a sweep of a component that is not total', withLine('sweep total Cl2(g) from 1 mM to 2 mM points 3')],
    ['P080', 'a sweep step that goes the wrong way', withLine('sweep pH from 6 to 11 step -0.1')],
    ['P081', 'a temperature below absolute zero', withLine('temperature -300 C')],
    ['P082', 'a number that reads as Infinity', replacing('total 1 mmol/L', 'total 1e309 mmol/L')],
    ['P083', 'a value outside its range', withLine('temperature 150 C')],
    ['W101', 'a component no reaction uses', withLine('component NH3 total 1 mmol/L')],
    ['W102', 'a suppressed solid no reaction defines', withLine('solid CuO(s) suppressed')],
    ['W103', 'a temperature away from 25 C with constants lacking dH', withLine('temperature 40 C')],
    ['W104', 'no balance and H+ given as a total', replacing('component H+ balance', 'component H+ total 1 mmol/L')],
    ['W105', 'a constant with no cite', replacing(' cite "hydrolysis (from memory)"', '')],
    ['W106', 'a value outside its usual range', replacing('total 1 mmol/L', 'total 8 mol/L')],
    ['W107', 'an ion size guessed from the charge', withLine('activity debye-huckel')],
    ['W108', 'an ion size with no effect', withLine('ion-size CuOH+ 5 Å')],
  ]
  for (const [code, what, source] of cases) {
    it(`${code}: ${what}`, () => {
      expect(codes(source)).toContain(code)
      expect(codes(CLEAN)).not.toContain(code)
    })
  }
})

describe('diagnostics point at the right place and say what to change', () => {
  it('puts an element imbalance on the reaction line with the amount', () => {
    const r = compile(withLine('reaction Cu^2+ + 2 H2O <=> Cu(OH)2 + H+ logK -16 cite "x"'))
    const d = r.diagnostics.find((x) => x.code === 'P020')!
    expect(d.range.line).toBe(8)
    expect(d.message).toContain('left side has 1 more H than right')
    expect(r.model).toBeNull()
  })
  it('asks for a concentration unit after a bare number', () => {
    const d = compile(replacing('total 1 mmol/L', 'total 1.5')).diagnostics[0]!
    expect(d.message).toBe('expected a concentration unit, such as mmol/L or mg/L after 1.5')
    expect(d.range.line).toBe(3)
  })
  it('offers the caret form as a fix that replaces the whole formula', () => {
    const src = withLine('component Ca2+ total 1 mM')
    const d = compile(src).diagnostics.find((x) => x.code === 'P012')!
    expect(d.message).toContain('Ca^2+')
    const fix = d.fixes![0]!
    const repaired = src.slice(0, fix.from) + fix.insert + src.slice(fix.to)
    expect(repaired).toContain('component Ca^2+ total 1 mM')
  })
})

describe('use', () => {
  const lib = `system "acids"\ncomponent H+ balance\ncomponent F- total 1 mM\nreaction H2O <=> H+ + OH- pKw 14 cite "water (from memory)"\nreaction HF <=> F- + H+ pKa 3.17 cite "hf (from memory)"\n`
  const resolveLibrary = (name: string, revision: number | null) =>
    name === 'acids' && (revision === null || revision === 1 || revision === 2) ? { source: lib, revision: revision ?? 2 } : null
  const file = `system "uses acids"\ncomponent H+ balance\ncomponent Na+ total 1 mM\nuse "acids"\n`
  it('imports the reactions a file needs and records the revision', () => {
    const r = compile(file, { resolveLibrary })
    expect(r.diagnostics).toEqual([])
    expect(r.model!.species.map((s) => s.name)).toContain('OH-')
    // HF needs F-, which is no component here: the library reaction is left out.
    expect(r.model!.species.map((s) => s.name)).not.toContain('HF')
    expect(r.model!.libraries).toEqual([{ name: 'acids', revision: 2 }])
    expect(r.model!.reactions[0]!.library).toBe('acids')
  })
  it('reports a library that does not exist and a revision that does not exist', () => {
    expect(codes(file.replace('"acids"', '"bases"'), { resolveLibrary })).toContain('P070')
    const d = compile(file.replace('"acids"', '"acids" @ 7'), { resolveLibrary }).diagnostics
    expect(d.map((x) => x.code)).toContain('P071')
    expect(d.find((x) => x.code === 'P071')!.message).toContain('latest is 2')
  })
  it('reports a library with errors on the use line', () => {
    const broken = () => ({ source: 'system "b"\ncomponent Ca+2 total 1 mM\n', revision: 1 })
    expect(codes(file, { resolveLibrary: broken })).toContain('P072')
  })
})

describe('syntax messages', () => {
  it('names a misspelt keyword after a component', () => {
    const d = compile(withLine('component Na+ totl 1 mM')).diagnostics.find((x) => x.code === 'P002')!
    expect(d.message).toContain("'totl' is not a keyword here")
    expect(d.range.line).toBe(8)
  })
  it('says what was expected after a number', () => {
    const d = compile(withLine('reaction Cu^2+ + Cl- <=> CuCl+')).diagnostics.find((x) => x.code === 'P002')!
    expect(d.message).toMatch(/^expected a constant kind/)
  })
})
