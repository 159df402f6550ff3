import { describe, expect, it } from 'vitest'
import { EditorState } from '@codemirror/state'
import { ensureSyntaxTree } from '@codemirror/language'
import { highlightTree, tagHighlighter, tags } from '@lezer/highlight'
import { allTokens } from '../../../shared/poise/tokens'
import { POISE_TOKEN_TABLE, TOKEN_STYLES } from '../../../codemirror/tokenStyles'
import { poiseLanguage } from '../../../codemirror/language'

/** The highlight class of every styled stretch of `doc`, as [text, class] pairs. */
function highlighted(doc: string): [string, string][] {
  const state = EditorState.create({ doc, extensions: [poiseLanguage] })
  const tree = ensureSyntaxTree(state, doc.length, 5000)!
  const highlighter = tagHighlighter([
    { tag: tags.definitionKeyword, class: 'statement' },
    { tag: tags.keyword, class: 'keyword' },
    { tag: tags.function(tags.name), class: 'constantKind' },
    { tag: tags.unit, class: 'unit' },
    { tag: tags.typeName, class: 'formula' },
    { tag: tags.number, class: 'number' },
    { tag: tags.lineComment, class: 'comment' },
    { tag: tags.string, class: 'string' },
    { tag: tags.invalid, class: 'invalid' },
  ])
  const out: [string, string][] = []
  highlightTree(tree, highlighter, (from, to, cls) => out.push([doc.slice(from, to), cls]))
  return out
}

describe('token → highlight table', () => {
  it('names every token of the lexer, so a new token cannot go unstyled', () => {
    const missing = allTokens.map((t) => t.name).filter((name) => !(name in TOKEN_STYLES))
    expect(missing).toEqual([])
  })

  it('names no token the lexer does not have', () => {
    const names = new Set(allTokens.map((t) => t.name))
    expect(Object.keys(TOKEN_STYLES).filter((name) => !names.has(name))).toEqual([])
  })

  it('leaves out only the tokens the highlighter never receives', () => {
    const unstyled = Object.keys(TOKEN_STYLES).filter((name) => !(name in POISE_TOKEN_TABLE))
    expect(unstyled.sort()).toEqual(['Newline', 'Whitespace'])
  })
})

describe('highlighting a Poise file', () => {
  it('tells the three meanings of K apart by position, as the compiler does', () => {
    const spans = highlighted('component K+ total 2 mmol/L\nreaction A <=> B K 3\ntemperature 298 K')
    expect(spans).toContainEqual(['K+', 'formula'])
    expect(spans.filter(([text]) => text === 'K').map(([, cls]) => cls)).toEqual(['constantKind', 'unit'])
  })

  it('styles statements, constant kinds, numbers, units and comments', () => {
    const spans = highlighted('reaction Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+ logbeta 7.4 dH -10 kJ/mol # strong')
    expect(spans).toEqual([
      ['reaction', 'statement'],
      ['Cu^2+', 'formula'],
      ['2', 'number'],
      ['NH3', 'formula'],
      ['Cu(NH3)2^2+', 'formula'],
      ['logbeta', 'constantKind'],
      ['7.4', 'number'],
      ['dH', 'keyword'],
      ['-10', 'number'],
      ['kJ/mol', 'unit'],
      ['# strong', 'comment'],
    ])
  })

  it('marks characters the lexer rejects as invalid', () => {
    expect(highlighted('component Na+ total 1 $ mM')).toContainEqual(['$', 'invalid'])
  })
})
