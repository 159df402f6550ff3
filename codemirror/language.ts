/**
 * The Poise language for CodeMirror: a stream language that runs the shared
 * chevrotain lexer over each line. Poise has one statement a line, so a line
 * lexed alone gives exactly the tokens the compiler sees.
 */
import { StreamLanguage, type StringStream } from '@codemirror/language'
import { lex } from '../shared/poise/lexer'
import { POISE_TOKEN_TABLE, roleOf, type TokenRole } from './tokenStyles'

export interface LineToken {
  name: string
  image: string
  /** Offsets inside the line, `to` exclusive. */
  from: number
  to: number
  role: TokenRole
}

/** The tokens of one line of Poise, in order, with their editor roles. */
export function lexLine(text: string): LineToken[] {
  return lex(text)
    .tokens.filter((token) => token.to > token.from)
    .map((token) => ({ ...token, role: roleOf(token.name) }))
}

interface LineState {
  tokens: LineToken[]
  next: number
}

/** Name StreamLanguage looks up in the token table for text the lexer rejected. */
const INVALID = 'invalid'

function readToken(stream: StringStream, state: LineState): string | null {
  if (stream.sol()) {
    state.tokens = lexLine(stream.string)
    state.next = 0
  }
  while (state.next < state.tokens.length && state.tokens[state.next]!.to <= stream.pos) state.next++
  const token = state.tokens[state.next]
  if (!token) {
    return skipGap(stream, stream.string.length)
  }
  if (token.from > stream.pos) {
    return skipGap(stream, token.from)
  }
  stream.pos = token.to
  state.next++
  return token.name
}

/** Text between tokens is whitespace, or something the lexer could not read (styled apart). */
function skipGap(stream: StringStream, until: number): string | null {
  if (stream.eatSpace()) {
    stream.pos = Math.min(stream.pos, until)
    return null
  }
  while (stream.pos < until && !/\s/.test(stream.peek() ?? ' ')) stream.pos++
  return INVALID
}

export const poiseLanguage = StreamLanguage.define<LineState>({
  name: 'poise',
  startState: () => ({ tokens: [], next: 0 }),
  copyState: (state) => ({ tokens: state.tokens, next: state.next }),
  token: readToken,
  tokenTable: POISE_TOKEN_TABLE,
  languageData: {
    commentTokens: { line: '#' },
  },
})
