import { describe, expect, it } from 'vitest'
import { diffModels } from '../../../shared/diff/model-diff'
import { compile } from '../../../shared/poise/index'
import { compiled, copperAmmine } from './fixtures'

describe('model diff', () => {
  it('reports a raised formation constant with old, new and the change in log K', () => {
    const changes = diffModels(compiled(copperAmmine(4)), compiled(copperAmmine(5)))
    expect(changes).toHaveLength(1)
    expect(changes[0]).toMatchObject({ kind: 'constant', entity: 'species', name: 'CuNH3^2+', from: 'logbeta 4.00', to: 'logbeta 5.00', logK: { from: 4, to: 5 }, toLine: 6 })
    expect(changes[0]!.deltaLogK).toBeCloseTo(1, 10)
  })

  it('finds nothing between a model and itself', () => {
    expect(diffModels(compiled(copperAmmine(4)), compiled(copperAmmine(4)))).toEqual([])
  })

  it('shows a solubility product as written, with the change of the formation constant behind it', () => {
    const solid = (pKsp: string) => copperAmmine(4, `reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH-  pKsp ${pKsp}  cite "demo value"\nreaction H2O <=> H+ + OH-  pKw 14.00  cite "demo value"\ncomponent H+ pH 7`)
    const [change] = diffModels(compiled(solid('19.66')), compiled(solid('19.32')))
    expect(change).toMatchObject({ kind: 'constant', entity: 'solid', from: 'pKsp 19.66', to: 'pKsp 19.32' })
    const recited = diffModels(compiled(solid('19.66')), compiled(solid('19.66').replace('pKsp 19.66  cite "demo value"', 'pKsp 19.66  cite "checked"')))
    expect(recited).toEqual([expect.objectContaining({ kind: 'citation', entity: 'solid', name: 'Cu(OH)2(s)', from: 'demo value', to: 'checked' })])
    // A smaller pKsp is a more soluble solid: its formation constant from the ions falls by the same 0.34 (definition of Ksp, common practice).
    expect(change!.deltaLogK).toBeCloseTo(-0.34, 9)
  })

  it('does not call a constant rewritten in another form a change', () => {
    // logbeta 4 and K 1e4 are the same constant (definition of log10, common practice).
    const rewritten = copperAmmine(4).replace('logbeta 4.00', 'K 1e4')
    expect(diffModels(compiled(copperAmmine(4)), compiled(rewritten))).toEqual([])
  })

  it('lists a new species first, then the larger constant change before the smaller', () => {
    const before = compiled(copperAmmine(4, 'reaction Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+  logbeta 7.50  cite "demo value"'))
    const after = compiled(copperAmmine(4.3, 'reaction Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+  logbeta 9.50  cite "demo value"\nreaction Cu^2+ + 3 NH3 <=> Cu(NH3)3^2+  logbeta 10.3  cite "demo value"'))
    const changes = diffModels(before, after)
    expect(changes.map(c => [c.kind, c.name])).toEqual([
      ['added', 'Cu(NH3)3^2+'],
      ['constant', 'Cu(NH3)2^2+'],
      ['constant', 'CuNH3^2+'],
    ])
    expect(changes[1]!.deltaLogK).toBeCloseTo(2, 10)
    expect(changes[2]!.deltaLogK).toBeCloseTo(0.3, 10)
  })

  it('reports a removed species, a changed total, a changed condition and a changed citation', () => {
    const before = compiled(copperAmmine(4, 'reaction Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+  logbeta 7.50  cite "demo value"'))
    const after = compiled(copperAmmine(4).replace('total 1.0 mmol/L', 'total 2.0 mmol/L').replace('temperature 25 C', 'temperature 35 C').replace('cite "demo value"', 'cite "checked again"'))
    const changes = diffModels(before, after)
    const byKind = Object.fromEntries(changes.map(c => [`${c.kind}:${c.name}`, c]))
    expect(byKind['removed:Cu(NH3)2^2+']).toBeDefined()
    expect(byKind['condition:temperature']).toMatchObject({ from: '25.0 °C', to: '35.0 °C' })
    // log10(2) = 0.301: the size of doubling a total (common practice).
    expect(byKind['total:Cu^2+']).toMatchObject({ from: 'total 1.00e-3 mol/L', to: 'total 2.00e-3 mol/L' })
    expect(byKind['total:Cu^2+']!.size).toBeCloseTo(Math.log10(2), 10)
    expect(byKind['citation:CuNH3^2+']).toMatchObject({ from: 'demo value', to: 'checked again' })
  })

  it('reports an ion size given in the file where debye-huckel guessed one before', () => {
    const dh = (extra: string) => compiled(copperAmmine(4, extra).replace('activity ideal', 'activity debye-huckel'))
    const changes = diffModels(dh(''), dh('ion-size CuNH3^2+ 6.5 Å\n'))
    expect(changes).toEqual([expect.objectContaining({ kind: 'assumption', entity: 'species', name: 'CuNH3^2+', from: '5 Å (guessed from the charge)', to: '6.5 Å (ion-size)' })])
    // With another activity model an ion size changes nothing worth showing.
    expect(diffModels(compiled(copperAmmine(4)), compiled(copperAmmine(4) + 'ion-size CuNH3^2+ 6.5 Å\n'))).toEqual([])
  })

  it('reports a solid that is suppressed in one revision and allowed to form in the other', () => {
    const solid = 'reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH-  pKsp 19.66  cite "demo value"\nreaction H2O <=> H+ + OH-  pKw 14.00  cite "demo value"\ncomponent H+ pH 7'
    const changes = diffModels(compiled(copperAmmine(4, `${solid}\nsolid Cu(OH)2(s) suppressed`)), compiled(copperAmmine(4, solid)))
    expect(changes).toEqual([expect.objectContaining({ kind: 'assumption', entity: 'solid', name: 'Cu(OH)2(s)', from: 'never precipitates', to: 'may precipitate' })])
  })

  it('reports a library moved to another revision, and the constant it changed', () => {
    const library = (pKa: string) => `system "acids"\ncomponent H+ balance\ncomponent F- total 1 mM\nreaction H2O <=> H+ + OH- pKw 14 cite "demo value"\nreaction HF <=> F- + H+ pKa ${pKa} cite "demo value"\n`
    const revisions: Record<number, string> = { 1: library('3.17'), 2: library('3.20') }
    const resolveLibrary = (name: string, revision: number | null) => name === 'acids' && revision !== null && revisions[revision] ? { source: revisions[revision]!, revision } : null
    const file = (revision: number) => `system "rinse"\ncomponent H+ balance\ncomponent F- total 1 mM\ncomponent Na+ total 1 mM\nuse "acids" @ ${revision}\n`
    const [a, b] = [1, 2].map(n => compile(file(n), { resolveLibrary }).model!)
    const changes = diffModels(a!, b!)
    expect(changes.map(c => [c.kind, c.name, c.from, c.to])).toEqual([
      ['condition', 'libraries used', 'acids @ 1', 'acids @ 2'],
      ['constant', 'HF', 'pKa 3.17', 'pKa 3.20'],
    ])
  })
})
