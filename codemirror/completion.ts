/**
 * Completion for Poise. What may come next is asked of the parser itself
 * (chevrotain's `computeContentAssist` on the tokens of the line left of the
 * word being typed), so completion never restates the grammar: a new
 * statement or clause is offered as soon as the parser has it. This module
 * only decides which words stand for the tokens the parser expects: keywords
 * by their text, units by the quantity of the number before them
 * (`quantityDimensions`), constant kinds that fit the reaction written so far
 * (`kindMismatch`, the checker's own test), and formulas from the last
 * compile's symbols and the document.
 */
import type { Completion, CompletionContext, CompletionResult } from '@codemirror/autocomplete'
import type { EditorState } from '@codemirror/state'
import type { IToken, TokenType } from 'chevrotain'
import type { PoiseSymbol } from '../shared/poise/index'
import { lexForParser } from '../shared/poise/lexer'
import { poiseParser } from '../shared/poise/parser'
import { CONSTANT_KINDS, ConstantKind, Formula, KEYWORD_TOKENS, PlusMinus, UNCERTAINTY_SIGNS, Unit, UNITS, Word } from '../shared/poise/tokens'
import { parseFormula } from '../shared/poise/formula'
import { kindMismatch, type PreparedTerm } from '../shared/poise/reactions'
import type { ConstantKind as ConstantKindName } from '../shared/poise/model'
import { quantityDimensions, unitInfo, type Dimension } from '../shared/poise/units'
import { abbreviationsOf, poiseSymbolsField } from './analysis'

/** The part of a word already typed: formulas, keywords with `-`, units such as `mmol/L`, `°C`. */
const WORD_BEFORE_CURSOR = /[A-Za-z°µμ][\w°µμ/()^·:+-]*$/

export type CompletionKind = 'keyword' | 'unit' | 'constantKind' | 'symbol' | 'source'

export interface CompletionWord {
  label: string
  kind: CompletionKind
  /** Accepting it also types the space before what must follow (a keyword or constant kind that something follows). */
  space: boolean
  detail?: string
}

const KEYWORD_TYPES = new Set<TokenType>(KEYWORD_TOKENS)
/** The clauses of a reaction the checker takes once (P004 when given twice): not offered again on a line that has one. */
const ONCE_A_REACTION = new Set(['dH', 'cite', 'fit'])

/** The tokens the parser reads on a line (comments and line breaks aside). */
function parserTokens(text: string): { tokens: IToken[]; clean: boolean } {
  const lexed = lexForParser(text)
  return { tokens: lexed.tokens.filter((t) => t.tokenType.name !== 'Newline'), clean: lexed.errors.length === 0 }
}

interface Expected { type: TokenType; ruleStack: string[] }

/** What the parser accepts after `tokens`, from the start of a statement. */
function expectedAfter(tokens: IToken[]): Expected[] {
  const seen = new Set<TokenType>()
  const out: Expected[] = []
  for (const path of poiseParser.computeContentAssist('statement', tokens)) {
    if (seen.has(path.nextTokenType)) continue
    seen.add(path.nextTokenType)
    out.push({ type: path.nextTokenType, ruleStack: path.ruleStack })
  }
  return out
}

/** A stand-in token of a keyword, to ask the parser what may follow it. */
function keywordToken(type: TokenType, after: IToken | undefined): IToken {
  const offset = after ? after.endOffset ?? after.startOffset + after.image.length : 0
  return { image: String(type.PATTERN), startOffset: offset + 1, endOffset: offset + String(type.PATTERN).length, tokenType: type, tokenTypeIdx: type.tokenTypeIdx! } as IToken
}

/**
 * The units offered: one spelling of micro (µ), or the `u` spellings when
 * the word typed starts with `u` (so typing `umol` still finds a unit).
 */
function unitWords(dimensions: Dimension[], typed: string): string[] {
  const otherMicro = typed.startsWith('u') ? /^[µμ]/ : /^[uμ]/
  return UNITS.filter((unit) => !otherMicro.test(unit) && dimensions.includes(unitInfo(unit)!.dimension))
}

/** The constant kinds the checker accepts for the reaction written so far (all of them while a formula does not parse). */
function fittingKinds(tokens: IToken[], symbols: readonly PoiseSymbol[]): string[] {
  const table = abbreviationsOf(symbols)
  const arrow = tokens.findIndex((t) => t.tokenType.name === 'Arrow')
  const terms = (part: IToken[]): PreparedTerm[] | null => {
    const out: PreparedTerm[] = []
    for (let i = 0; i < part.length; i++) {
      const t = part[i]!
      if (t.tokenType !== Formula) continue
      const formula = parseFormula(t.image, table).formula
      if (!formula) return null
      const before = part[i - 1]
      const coefficient = before?.tokenType.name === 'Number' ? Number(before.image) : 1
      out.push({ coefficient, formula, tok: { image: t.image, from: t.startOffset, to: t.startOffset + t.image.length } })
    }
    return out
  }
  const left = terms(tokens.slice(1, arrow))
  const right = terms(tokens.slice(arrow + 1))
  if (!left || !right) return [...CONSTANT_KINDS]
  const components = new Set(symbols.filter((s) => s.kind === 'component').map((s) => s.name))
  // Without the symbols of a compile, every formula may be a component: do not refuse on that ground.
  const isComponent = (name: string) => components.size === 0 || components.has(name)
  return CONSTANT_KINDS.filter((kind) => kindMismatch(kind as ConstantKindName, left, right, isComponent) === null)
}

/** Formulas written in the document's reactions that no component line declares and no reaction of the last compile defines, in order of appearance. */
export function undeclaredFormulas(doc: string, symbols: readonly PoiseSymbol[]): string[] {
  const table = abbreviationsOf(symbols)
  const declared = new Set<string>()
  const used: string[] = []
  for (const line of doc.split(/\r?\n/)) {
    const tokens = lexForParser(line).tokens
    const first = tokens[0]?.image
    const formulas = tokens.filter((t) => t.tokenType === Formula).map((t) => parseFormula(t.image, table).formula?.name ?? t.image)
    if (first === 'component' && formulas[0]) declared.add(formulas[0])
    if (first === 'reaction') used.push(...formulas)
  }
  const defined = new Set(symbols.filter((s) => s.kind !== 'component').map((s) => s.name))
  return [...new Set(used)].filter((name) => name !== 'H2O' && !declared.has(name) && !defined.has(name))
}

/** The source keys the document declares (`source KEY "…"`), for `cite`. */
function sourceKeys(doc: string): string[] {
  const keys: string[] = []
  for (const line of doc.split(/\r?\n/)) {
    const tokens = lexForParser(line).tokens
    if (tokens[0]?.image === 'source' && tokens[1]) keys.push(tokens[1].image)
  }
  return keys
}

/** What a `limit dissolved` may name: the elements the components hold (H and O aside), then the components (H+ aside). */
export function limitTargets(symbols: readonly PoiseSymbol[]): string[] {
  const components = symbols.filter((s) => s.kind === 'component' && s.name !== 'H+')
  const elements = [...new Set(components.flatMap((c) => Object.keys(c.elements)))].filter((e) => e !== 'H' && e !== 'O')
  return [...elements, ...components.map((c) => c.name)]
}

/** The formulas that fit where the parser expects one, by the rule it is in. */
function formulaWords(rule: string, tokens: IToken[], symbols: readonly PoiseSymbol[], doc: string): { label: string; detail: string }[] {
  const named = (list: readonly PoiseSymbol[]) => list.map((s) => ({ label: s.name, detail: s.kind === 'abbreviation' ? `abbreviation: ${s.stands}` : s.kind }))
  const of = (...kinds: PoiseSymbol['kind'][]) => named(symbols.filter((s) => kinds.includes(s.kind)))
  switch (rule) {
    case 'componentStatement':
      // A component not declared yet: what the reactions use, then the file's abbreviations to write one with.
      return [...undeclaredFormulas(doc, symbols).map((label) => ({ label, detail: 'used, not declared' })), ...of('abbreviation')]
    case 'term':
      return of('component', 'species', 'solid', 'gas', 'abbreviation')
    case 'solidStatement':
      return of('solid')
    case 'ionSizeStatement':
      return named(symbols.filter((s) => s.ionSize !== null))
    case 'sweepVariable': {
      // `sweep total F` / `sweep pressure F`: a component given that way.
      const mode = tokens[tokens.length - 1]?.image
      return named(symbols.filter((s) => s.kind === 'component')).filter((c) => mode !== 'pressure' || c.label.endsWith('(g)'))
    }
    case 'limitStatement':
      return limitTargets(symbols).map((label) => ({ label, detail: symbols.some((s) => s.name === label) ? 'component' : 'element' }))
    case 'titrantStatement':
      return of('component', 'species')
    case 'citation':
    case 'sourceStatement':
      return sourceKeys(doc).map((label) => ({ label, detail: 'source' }))
    default:
      return []
  }
}

/**
 * What may be typed with the cursor after `textBefore` (the line left of the
 * word being typed), given the last compile's symbols and the whole document.
 * Null when nothing can follow there.
 */
export function planCompletion(textBefore: string, typed: string, symbols: readonly PoiseSymbol[], doc = ''): CompletionWord[] | null {
  const { tokens, clean } = parserTokens(textBefore)
  if (!clean) return null
  const expected = expectedAfter(tokens)
  if (expected.length === 0) return null
  const last = tokens[tokens.length - 1]
  // After a number whose quantity needs a unit, only its units: the grammar's unit is optional (a pH, a count) but the checker's is not.
  // A sweep's `step` and a titration's `from` take the unit of their end when they give none.
  const before = tokens[tokens.length - 2]?.image
  const dimensions = last?.tokenType.name === 'Number' ? quantityDimensions(tokens.map((t) => t.image), tokens.length - 1) : []
  const unitRequired = dimensions.length > 0 && before !== 'step' && !(tokens[0]?.image === 'titrate' && before === 'from')
  const words: CompletionWord[] = []
  for (const { type, ruleStack } of expected) {
    if (unitRequired && type !== Unit) continue
    const rule = ruleStack[ruleStack.length - 1] ?? 'statement'
    if (KEYWORD_TYPES.has(type)) {
      // A citation's key or a source's name is the file's own word, whatever the parser would accept there.
      if ((rule === 'citation' && last?.image === 'cite') || (rule === 'sourceStatement' && last?.image === 'source')) continue
      const word = String(type.PATTERN)
      if (ruleStack.includes('reactionStatement') && ONCE_A_REACTION.has(word) && tokens.some((t) => t.image === word)) continue
      const more = expectedAfter([...tokens, keywordToken(type, last)]).length > 0
      words.push({ label: word, kind: 'keyword', space: more })
    } else if (type === PlusMinus) {
      for (const sign of UNCERTAINTY_SIGNS) words.push({ label: sign, kind: 'keyword', space: true, detail: 'uncertainty' })
    } else if (type === ConstantKind) {
      for (const kind of fittingKinds(tokens, symbols)) words.push({ label: kind, kind: 'constantKind', space: true, detail: 'constant' })
    } else if (type === Unit && last?.tokenType.name === 'Number') {
      for (const unit of unitWords(dimensions, typed)) words.push({ label: unit, kind: 'unit', space: false })
    } else if (type === Formula || type === Word) {
      for (const f of formulaWords(rule, tokens, symbols, doc)) words.push({ label: f.label, kind: rule === 'citation' || rule === 'sourceStatement' ? 'source' : 'symbol', space: false, detail: f.detail })
    }
  }
  const unique = words.filter((w, i) => words.findIndex((o) => o.label === w.label) === i)
  return unique.length ? unique : null
}

const COMPLETION_TYPE: Record<CompletionKind, string> = {
  keyword: 'keyword',
  unit: 'unit',
  constantKind: 'constant',
  symbol: 'variable',
  source: 'text',
}

function toOption(word: CompletionWord): Completion {
  return {
    label: word.label,
    type: COMPLETION_TYPE[word.kind],
    ...(word.detail ? { detail: word.detail } : {}),
    ...(word.space ? { apply: `${word.label} ` } : {}),
  }
}

/** The completions at `pos`, or null; split out of the source so it can be checked on a bare state. */
export function completionsAt(state: EditorState, pos: number, explicit: boolean): CompletionResult | null {
  const line = state.doc.lineAt(pos)
  const textBefore = line.text.slice(0, pos - line.from)
  const typed = WORD_BEFORE_CURSOR.exec(textBefore)
  const wordFrom = typed ? textBefore.length - typed[0].length : textBefore.length
  if (!typed && !explicit && !/\s$/.test(textBefore)) return null
  if (lexForParser(textBefore).comments.length > 0) return null
  const symbols = state.field(poiseSymbolsField, false) ?? []
  const words = planCompletion(textBefore.slice(0, wordFrom), typed?.[0] ?? '', symbols, state.doc.toString())
  if (!words) return null
  return {
    from: line.from + wordFrom,
    options: words.map(toOption),
    validFor: /^[\w°µμ/()^·:+-]*$/,
  }
}

export function poiseCompletionSource(context: CompletionContext): CompletionResult | null {
  return completionsAt(context.state, context.pos, context.explicit)
}
