/**
 * Components must be independent as basis species of the reactions (no
 * reaction relates them), not as element vectors: a homologous series of
 * acids is three components; H+ beside OH- with the water reaction is not.
 */
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { solve } from '../../../server/solver/index'

// pKa at 25 °C: acetic 4.76, propionic 4.87, butyric 4.82 (common compilations of
// acid dissociation constants, from memory).
const PKA = { 'CH3COO-': 4.76, 'CH3CH2COO-': 4.87, 'CH3CH2CH2COO-': 4.82 } as const
const ACID = { 'CH3COO-': 'CH3COOH', 'CH3CH2COO-': 'CH3CH2COOH', 'CH3CH2CH2COO-': 'CH3CH2CH2COOH' } as const

function digester(hSpec: string): string {
  return `system "Digester liquor with three fatty acids"
component H+ ${hSpec}
component Na+ total 20 mmol/L
component CH3COO- total 30 mmol/L
component CH3CH2COO- total 8 mmol/L
component CH3CH2CH2COO- total 4 mmol/L
reaction H2O <=> H+ + OH- pKw 14 cite "from memory"
reaction CH3COOH <=> CH3COO- + H+ pKa ${PKA['CH3COO-']} cite "from memory"
reaction CH3CH2COOH <=> CH3CH2COO- + H+ pKa ${PKA['CH3CH2COO-']} cite "from memory"
reaction CH3CH2CH2COOH <=> CH3CH2CH2COO- + H+ pKa ${PKA['CH3CH2CH2COO-']} cite "from memory"
`
}

describe('a homologous series of weak acids', () => {
  it('compiles: acetate, propionate and butyrate are three independent components', () => {
    const r = compile(digester('balance'))
    expect(r.diagnostics).toEqual([])
    expect(r.model!.components.map((c) => c.name)).toEqual(['H+', 'Na+', 'CH3COO-', 'CH3CH2COO-', 'CH3CH2CH2COO-'])
  })

  // Henderson–Hasselbalch with ideal activities: [A-]/[HA] = 10^(pH − pKa), exact
  // for each acid at a fixed pH (the definition of Ka).
  it('solves at a fixed pH to each acid’s own Henderson–Hasselbalch ratio', () => {
    const model = compile(digester('pH 5')).model!
    const r = solve(model)
    expect(r.converged).toBe(true)
    const conc = (name: string) => r.species.find((s) => s.name === name)!.concentration
    for (const base of Object.keys(PKA) as (keyof typeof PKA)[]) {
      expect(conc(base) / conc(ACID[base])).toBeCloseTo(10 ** (5 - PKA[base]), 8)
      const total = model.components.find((c) => c.name === base)!.value
      expect((conc(base) + conc(ACID[base])) / total).toBeCloseTo(1, 10)
    }
  })

  it('solves with H+ from the charge balance: the balance closes', () => {
    const r = solve(compile(digester('balance')).model!)
    expect(r.converged).toBe(true)
    const charge = r.species.reduce((sum, s) => sum + s.charge * s.concentration, 0)
    expect(Math.abs(charge)).toBeLessThan(1e-12)
    // 20 mmol/L of base against 42 mmol/L of acids with pKa near 4.8: a buffer near pH 4.7.
    expect(r.pH).toBeGreaterThan(4.3)
    expect(r.pH).toBeLessThan(5.1)
  })
})

describe('components that a reaction relates are refused (P060), saying what to change', () => {
  const water = 'reaction H2O <=> H+ + OH- pKw 14 cite "x"'
  it('H+ and OH- with the water reaction', () => {
    const r = compile(`system "s"\ncomponent H+ balance\ncomponent OH- total 1 mmol/L\n${water}\n`)
    const p060 = r.diagnostics.filter((d) => d.code === 'P060')
    expect(p060).toHaveLength(1)
    expect(p060[0]!.range.line).toBe(4)
    expect(p060[0]!.message).toContain('OH- is made of H+')
    expect(p060[0]!.message).toContain('Remove `component OH-` and let this reaction define it')
    expect(r.model).toBeNull()
  })
  it('a relation through a defined species', () => {
    const r = compile(`system "s"
component H+ balance
component CO3^2- total 1 mmol/L
component H2CO3 total 1 mmol/L
${water}
reaction HCO3- <=> CO3^2- + H+ pKa 10.33 cite "x"
reaction H2CO3 <=> HCO3- + H+ pKa 6.35 cite "x"
`)
    const p060 = r.diagnostics.filter((d) => d.code === 'P060')
    expect(p060.map((d) => d.range.line)).toEqual([7])
    expect(p060[0]!.message).toContain('H2CO3 is made of H+, CO3^2- (through HCO3-, line 6) and water')
  })
  it('a relation in a library reaction, reported at the use line', () => {
    const lib = `system "carbonate"\ncomponent H+ balance\ncomponent CO3^2- total 1 mM\n${water}\nreaction HCO3- <=> CO3^2- + H+ pKa 10.33 cite "x"\n`
    const r = compile(`system "s"\nuse "carbonate"\ncomponent H+ balance\ncomponent CO3^2- total 1 mmol/L\ncomponent HCO3- total 1 mmol/L\n`, {
      resolveLibrary: (name) => (name === 'carbonate' ? { source: lib, revision: 1 } : null),
    })
    const p060 = r.diagnostics.filter((d) => d.code === 'P060')
    expect(p060).toHaveLength(1)
    expect(p060[0]!.range.line).toBe(2)
    expect(p060[0]!.message).toContain('library "carbonate" line 5')
    expect(p060[0]!.message).toContain('Remove `component HCO3-`')
  })
  it('adds no relation error after a component that failed its own check', () => {
    const r = compile(`system "s"\ncomponent H+ balance\ncomponent OH- total 1e6 mol/L\n${water}\n`)
    expect(r.diagnostics.map((d) => d.code)).toEqual(['P083'])
  })
  it('still takes a library reaction that only repeats what the file defines as no relation', () => {
    const lib = `system "carbonate"\ncomponent H+ balance\ncomponent CO3^2- total 1 mM\nreaction HCO3- <=> CO3^2- + H+ pKa 10.33 cite "x"\n`
    const r = compile(`system "s"\nuse "carbonate"\ncomponent H+ balance\ncomponent CO3^2- total 1 mmol/L\nreaction HCO3- <=> CO3^2- + H+ pKa 10.3 cite "x"\n`, {
      resolveLibrary: () => ({ source: lib, revision: 1 }),
    })
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
  })
})
