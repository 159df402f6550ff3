/**
 * The Poise lexer: one chevrotain lexer built once from tokens.ts. `lex` is
 * what the editor's highlighter calls; the compiler uses `lexForParser`.
 */
import { Lexer, type IToken } from 'chevrotain'
import { allTokens } from './tokens'

// Offsets and start lines are all anything reads (diagnostics compute their
// own end line and column), and the first-character optimisation must hold
// so a token type is not tried at every position.
const poiseLexer = new Lexer(allTokens, { ensureOptimizations: true, positionTracking: 'onlyStart' })

export interface LexedToken {
  /** The chevrotain token name (see grammar/README.md, "Token names"). */
  name: string
  image: string
  from: number
  to: number
}

export interface LexError {
  message: string
  from: number
  to: number
}

export interface RawLex {
  /** Tokens the parser reads, Newline included, comments excluded. */
  tokens: IToken[]
  comments: IToken[]
  errors: LexError[]
}

export function lexForParser(text: string): RawLex {
  const result = poiseLexer.tokenize(text)
  const errors = result.errors.map((e) => {
    const ch = text.slice(e.offset, e.offset + e.length)
    return {
      message: `unexpected character '${ch.length > 12 ? ch.slice(0, 12) + '…' : ch}': it has no meaning in Poise here`,
      from: e.offset,
      to: e.offset + Math.max(1, e.length),
    }
  })
  return { tokens: result.tokens, comments: result.groups.comments ?? [], errors }
}

/** Tokens in document order for highlighting, comments included, line breaks left out. */
export function lex(text: string): { tokens: LexedToken[]; errors: LexError[] } {
  const raw = lexForParser(text)
  const tokens = [...raw.tokens, ...raw.comments]
    .filter((t) => t.tokenType.name !== 'Newline')
    .sort((a, b) => a.startOffset - b.startOffset)
    .map((t) => ({ name: t.tokenType.name, image: t.image, from: t.startOffset, to: t.startOffset + t.image.length }))
  return { tokens, errors: raw.errors }
}
