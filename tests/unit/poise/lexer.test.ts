import { describe, expect, it } from 'vitest'
import { lex, findUses } from '../../../shared/poise/index'

const names = (text: string) => lex(text).tokens.map((t) => `${t.name}:${t.image}`)

describe('lexer: position decides what K, M and C are', () => {
  it('reads K after a number as kelvin, after a species as the constant kind, and as potassium elsewhere', () => {
    expect(names('temperature 298 K')).toContain('Unit:K')
    expect(names('reaction K+ + Cl- <=> KCl K 0.5')).toEqual([
      'ReactionKeyword:reaction', 'Formula:K+', 'Plus:+', 'Formula:Cl-', 'Arrow:<=>', 'Formula:KCl', 'ConstantKind:K', 'Number:0.5',
    ])
  })
  it('reads M and C after a number as units', () => {
    expect(names('total 1 M')).toContain('Unit:M')
    expect(names('temperature 25 C')).toContain('Unit:C')
    expect(names('component C6H5O7^3- total 1 mM')).toContain('Formula:C6H5O7^3-')
  })
  it('keeps comments and strings as tokens for the highlighter', () => {
    expect(names('system "A # b" # note')).toEqual(['SystemKeyword:system', 'String:"A # b"', 'Comment:# note'])
  })
  it('reads 10^x and exponents as numbers', () => {
    expect(names('K 10^-3.5 2e-3')).toEqual(['Formula:K', 'Number:10^-3.5', 'Number:2e-3'])
  })
})

describe('findUses', () => {
  it('lists the libraries a file uses, with revision and line', () => {
    expect(findUses('system "x"\nuse "acids"\nuse "metals" @ 3\n# use "not"\n')).toEqual([
      { name: 'acids', revision: null, line: 2 },
      { name: 'metals', revision: 3, line: 3 },
    ])
  })
})
