// The ± after a constant and the `fit` mark: what the compiled model carries,
// and the messages for what cannot be read.
import { describe, expect, it } from 'vitest'
import { compile, type CompileOptions } from '../../../shared/poise/index'
import { lex } from '../../../shared/poise/lexer'
import { constantAt } from '../../../codemirror/hover'
import { lexLine } from '../../../codemirror/language'

const acetate = (constant: string, extra = '') => `system "Acetate buffer"
component H+ balance
component CH3COO- total 10 mmol/L
component Na+ total 10 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water (from memory)"
reaction CH3COOH <=> CH3COO- + H+ ${constant}
${extra}`

const reactionOf = (source: string, defines: string, options?: CompileOptions) => {
  const result = compile(source, options)
  expect(result.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
  return result.model!.reactions.find((r) => r.defines === defines)!
}

const errors = (source: string) => compile(source).diagnostics.filter((d) => d.severity === 'error').map((d) => ({ code: d.code, message: d.message }))

describe('a constant with an uncertainty', () => {
  it('reads ± and its ASCII spelling +- as the same uncertainty, in the kind’s own units', () => {
    for (const sign of ['±', '+-']) {
      const r = reactionOf(acetate(`pKa 4.76 ${sign} 0.05 cite "demo"`), 'CH3COOH')
      expect(r).toMatchObject({ kind: 'pKa', value: 4.76, logK: -4.76, uncertainty: 0.05, logKUncertainty: 0.05, fit: false })
    }
    // Written without a space, too.
    expect(reactionOf(acetate('pKa 4.76 +-0.05 cite "demo"'), 'CH3COOH').uncertainty).toBe(0.05)
  })

  it('converts a ± on K to log10 units: σ(log K) = σ/(K ln 10)', () => {
    // d log10 K / dK = 1/(K ln 10) (closed form of the derivative of log10).
    const r = reactionOf(acetate('Ka 1.75e-5 ± 0.10e-5 cite "demo"'), 'CH3COOH')
    expect(r.uncertainty).toBe(0.10e-5)
    expect(r.logKUncertainty).toBeCloseTo(0.10e-5 / (1.75e-5 * Math.LN10), 12)
  })

  it('leaves uncertainty and fit empty on a constant written as before', () => {
    const r = reactionOf(acetate('pKa 4.76 dH -0.4 kJ/mol cite "demo"'), 'CH3COOH')
    expect(r).toMatchObject({ uncertainty: null, logKUncertainty: null, fit: false, dH: -0.4, cite: 'demo' })
  })

  it('marks a constant fit, with or without ±, before or after dH and cite', () => {
    expect(reactionOf(acetate('pKa 4.70 fit'), 'CH3COOH')).toMatchObject({ fit: true, uncertainty: null })
    expect(reactionOf(acetate('pKa 4.70 +- 0.05 fit cite "demo"'), 'CH3COOH')).toMatchObject({ fit: true, uncertainty: 0.05 })
    expect(reactionOf(acetate('pKa 4.70 cite "demo" dH 1 kJ/mol fit'), 'CH3COOH')).toMatchObject({ fit: true, dH: 1 })
    expect(reactionOf(acetate('pKa 4.70 cite "demo"'), 'OH-').fit).toBe(false)
  })

  it('still reads `fit` as a source key, as files written before it was a keyword did', () => {
    const r = reactionOf(acetate('pKa 4.76 cite fit', 'source fit "a fit of our own titrations (demo)"'), 'CH3COOH')
    expect(r).toMatchObject({ cite: 'a fit of our own titrations (demo)', fit: false })
  })

  it('gives each formation constant the reactions it was chained through', () => {
    const source = acetate('pKa 4.76 ± 0.02 cite "demo"', 'reaction CH3COOH2+ <=> CH3COOH + H+ pKa -6 ± 0.5 cite "demo"')
    const model = compile(source).model!
    const index = (defines: string) => model.reactions.findIndex((r) => r.defines === defines)
    const weights = (name: string) => model.species.find((s) => s.name === name)!.reactionWeights
    // CH3COOH2+ = CH3COO- + 2 H+ through both reactions, each dissociation counted with −1.
    expect(weights('CH3COOH2+')).toEqual([{ reaction: index('CH3COOH'), weight: -1 }, { reaction: index('CH3COOH2+'), weight: -1 }].sort((a, b) => a.reaction - b.reaction))
    expect(weights('CH3COO-')).toEqual([])
    const sp = model.species.find((s) => s.name === 'CH3COOH2+')!
    expect(sp.logKRef).toBeCloseTo(-weights('CH3COOH2+')!.reduce((sum, w) => sum - w.weight * model.reactions[w.reaction]!.logK, 0), 12)
  })

  it('refuses a ± that is zero or negative, and says what to write', () => {
    for (const bad of ['0', '-0.05']) {
      const found = errors(acetate(`pKa 4.76 ± ${bad} cite "demo"`))
      expect(found).toEqual([{ code: 'P042', message: 'an uncertainty must be a positive number, the standard uncertainty in pKa units: write pKa 4.76 ± 0.05 (or +- 0.05), or leave the ± out when it is not known' }])
    }
    expect(errors(acetate('logK -4.76 ± 0 cite "demo"'))[0]!.message).toContain('in log units: write logK -4.76 ± 0.05')
  })

  it('refuses a ± beyond 20 log units and warns beyond 3, naming the kind’s units', () => {
    expect(errors(acetate('pKa 4.76 ± 25 cite "demo"'))).toEqual([{ code: 'P083', message: expect.stringContaining('outside the range Poise accepts (above 0 and up to 20)') }])
    // ± 1e-4 on a Ka of 1.75e-5 is 2.48 log units: accepted; ± 1e-3 is 24.8: refused, with the K-units hint.
    expect(errors(acetate('Ka 1.75e-5 ± 1e-4 cite "demo"'))).toEqual([])
    const tooWide = errors(acetate('Ka 1.75e-5 ± 1e-3 cite "demo"'))
    expect(tooWide[0]!.message).toContain('(from Ka 1.75e-5 ± 1e-3)')
    expect(tooWide[0]!.message).toContain('for K, Ka, beta and Ksp the ± is in K')
    const warned = compile(acetate('pKa 4.76 ± 4 cite "demo"')).diagnostics
    expect(warned.map((d) => d.code)).toEqual(['W106'])
  })

  it('refuses a ± with nothing after it, a ± before the value and fit twice', () => {
    expect(errors(acetate('pKa 4.76 ± cite "demo"'))[0]).toMatchObject({ code: 'P002', message: "expected a number after '±', found 'cite'" })
    expect(errors(acetate('pKa ± 0.05 4.76'))[0]!.code).toBe('P002')
    expect(errors(acetate('pKa 4.76 fit fit'))).toEqual([{ code: 'P004', message: 'fit is given twice: keep one' }])
    // A ± belongs to the constant's value, not to dH.
    expect(errors(acetate('pKa 4.76 dH 2 kJ/mol ± 1'))[0]!.code).toBe('P002')
  })

  it('lexes ± and +- as one token, and `fit` as a keyword', () => {
    const names = (text: string) => lex(text).tokens.map((t) => t.name)
    expect(names('pKa 4.7 ± 0.05 fit')).toEqual(['ConstantKind', 'Number', 'PlusMinus', 'Number', 'FitKeyword'])
    expect(names('pKa 4.7 +- 0.05')).toEqual(['ConstantKind', 'Number', 'PlusMinus', 'Number'])
    // A species' charge sign is still part of its formula.
    expect(names('reaction HSO4- <=> SO4^2- + H+')).toEqual(['ReactionKeyword', 'Formula', 'Arrow', 'Formula', 'Plus', 'Formula'])
  })
})

describe('fit on a constant from a library', () => {
  const library = `system "Acids"
component H+ balance
component CH3COO- total 1 mM
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 ± 0.03 fit cite "demo"
`
  const resolveLibrary: CompileOptions['resolveLibrary'] = (name) => (name === 'acids' ? { source: library, revision: 2 } : null)
  const user = (extra = '') => `system "Rinse"
component H+ balance
component CH3COO- total 5 mM
use "acids"
${extra}`

  it('keeps the library’s ± but not its fit mark, and says how to fit it here', () => {
    const result = compile(user(), { resolveLibrary })
    const r = result.model!.reactions.find((x) => x.defines === 'CH3COOH')!
    expect(r).toMatchObject({ library: 'acids', fit: false, uncertainty: 0.03, logKUncertainty: 0.03 })
    const w = result.diagnostics.find((d) => d.code === 'W111')!
    expect(w.severity).toBe('warning')
    expect(w.message).toBe('library "acids" marks a constant fit (line 4), but a library\'s constants stay fixed in the systems that use it: to fit it here, copy its reaction into this file with fit after the value (a reaction in the file takes the place of the library\'s)')
  })

  it('fits the reaction when the file writes it itself, and then does not warn', () => {
    const result = compile(user('reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 fit cite "demo"'), { resolveLibrary })
    expect(result.diagnostics.map((d) => d.code)).not.toContain('W111')
    const r = result.model!.reactions.find((x) => x.defines === 'CH3COOH')!
    expect(r).toMatchObject({ library: null, fit: true, uncertainty: null })
  })
})

describe('hover on a constant', () => {
  const line = 'reaction CH3COOH <=> CH3COO- + H+ Ka 1.75e-5 ± 1e-6 fit cite "demo"'
  const at = (word: string) => constantAt(lexLine(line), line.indexOf(word) + 1)

  it('shows the ± as written and in log10 K, and whether it is fitted, on any part of the constant', () => {
    for (const word of ['Ka', '1.75e-5', '±', '1e-6', 'fit']) {
      const found = at(word)!
      expect(found.description.title).toBe('constant · Ka')
      expect(Object.fromEntries(found.description.rows)).toEqual({
        value: 'Ka 1.75e-5',
        kind: 'acid dissociation constant',
        'log₁₀ K': '-4.75696 (of the reaction as written)',
        uncertainty: '± 1e-6 (± 0.0248168 in log₁₀ K); answers carry a ± from it',
        fit: 'to be fitted to a data set (the value is the starting guess)',
      })
    }
    expect(at('CH3COOH')).toBeNull()
    expect(at('demo')).toBeNull()
  })

  it('says how to give a ± when there is none', () => {
    const plain = 'reaction CH3COOH <=> CH3COO- + H+ pKa 4.76'
    const rows = Object.fromEntries(constantAt(lexLine(plain), plain.indexOf('pKa'))!.description.rows)
    expect(rows.uncertainty).toBe('none given: write ± after the value (e.g. ± 0.05) to carry it into the answers')
    expect(rows.fit).toBe('no: the value is used as written')
  })
})

describe('the model diff of an uncertainty', () => {
  it('reports a ± or a fit mark that changed, and nothing when only the layout did', async () => {
    const { diffModels } = await import('../../../shared/diff/model-diff')
    const model = (constant: string) => compile(acetate(constant)).model!
    const changes = diffModels(model('pKa 4.76 cite "demo"'), model('pKa 4.76 ± 0.03 fit cite "demo"'))
    expect(changes).toEqual([expect.objectContaining({ kind: 'assumption', name: 'CH3COOH', from: 'no ±', to: 'pKa ± 0.03, fit' })])
    expect(diffModels(model('pKa 4.76 ± 0.03 cite "demo"'), model('pKa 4.76 +- 0.03 cite "demo"'))).toEqual([])
  })
})

describe('uncertainty draws N [seed S]', () => {
  const swept = (line: string, study = 'sweep total Na+ from 5 mmol/L to 15 mmol/L points 11') => acetate('pKa 4.76 ± 0.02 cite "demo"', `${study}\n${line}`)

  it('puts the draws and the seed into the model (seed 1 when none is given)', () => {
    expect(compile(swept('uncertainty draws 200 seed 7')).model!.monteCarlo).toEqual({ draws: 200, seed: 7, line: 8 })
    expect(compile(swept('uncertainty draws 200')).model!.monteCarlo).toEqual({ draws: 200, seed: 1, line: 8 })
    expect(compile(swept('')).model!.monteCarlo).toBeUndefined()
  })

  it('refuses too few or too many draws, a bad seed, and draws × points beyond the limit, saying what to write', () => {
    expect(errors(swept('uncertainty draws 10'))).toEqual([{ code: 'P086', message: 'draws is a whole number from 40 to 2000 (fewer make the 2.5–97.5 % band mean little, more take long for bands that no longer move): write uncertainty draws 200' }])
    expect(errors(swept('uncertainty draws 100.5'))[0]!.code).toBe('P086')
    expect(errors(swept('uncertainty draws 100 seed -3'))).toEqual([{ code: 'P086', message: 'a seed is a whole number from 0 to 2147483647: write seed 7' }])
    expect(errors(swept('uncertainty draws 2000', 'sweep total Na+ from 5 mmol/L to 15 mmol/L points 101'))).toEqual([{ code: 'P086', message: '2000 draws of 101 points are 202000 solves, more than the 40000 one run may make: use at most 396 draws, or fewer points' }])
    expect(errors(swept('uncertainty draws 100\nuncertainty draws 50'))[0]!.code).toBe('P004')
  })

  it('warns when the line can do nothing: no sweep or curve, or no constant with a ±', () => {
    const single = compile(acetate('pKa 4.76 ± 0.02 cite "demo"', 'uncertainty draws 200')).diagnostics
    expect(single.map((d) => [d.code, d.message])).toEqual([['W112', 'uncertainty draws applies to a sweep or a titration curve, not to a map; a single solve (or a dose) gives its ± by linear propagation: the line has no effect here']])
    const plain = compile(acetate('pKa 4.76 cite "demo"', 'sweep total Na+ from 5 mmol/L to 15 mmol/L points 11\nuncertainty draws 200')).diagnostics
    expect(plain.map((d) => d.code)).toEqual(['W112'])
    expect(plain[0]!.message).toContain('no constant carries a ±')
    // Neither leaves a Monte Carlo in the model.
    expect(compile(acetate('pKa 4.76 ± 0.02 cite "demo"', 'uncertainty draws 200')).model!.monteCarlo).toBeUndefined()
    expect(compile(acetate('pKa 4.76 cite "demo"', 'sweep total Na+ from 5 mmol/L to 15 mmol/L points 11\nuncertainty draws 200')).model!.monteCarlo).toBeUndefined()
  })
})
