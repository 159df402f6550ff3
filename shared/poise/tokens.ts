/**
 * Every token of Poise, in one module: the lexer, the parser and the editor's
 * highlighter all use these definitions, so a word is classified the same way
 * everywhere. Token names are part of the contract with the highlighter
 * (documented in grammar/README.md): keep them stable.
 *
 * Three words are deliberately ambiguous because chemists write them so:
 * `K` (potassium, the constant kind, kelvin), `M` (molar) and `C` (carbon,
 * degrees Celsius). Position decides, which is why Unit and ConstantKind are
 * custom patterns that look at the token before them.
 */
import { createToken, Lexer, type IToken, type TokenType } from 'chevrotain'
import { UNIT_SPELLINGS, UNITS_AFTER_NUMBER_ONLY } from './units'
import { CONSTANT_KINDS as CONSTANT_KIND_LIST, KINDS_AFTER_FORMULA_ONLY } from './model'


export const Comment = createToken({ name: 'Comment', pattern: /#[^\n\r]*/, group: 'comments' })
export const Newline = createToken({ name: 'Newline', pattern: /\r\n|\r|\n/, line_breaks: true })
export const Whitespace = createToken({ name: 'Whitespace', pattern: /[ \t\f\u00a0\u2009]+/, group: Lexer.SKIPPED })
export const StringLiteral = createToken({ name: 'String', pattern: /"(?:[^"\\\n\r]|\\.)*"/, label: 'a quoted text' })
/** An opening quote with no closing one on the same line; the checker reports it. */
export const UnterminatedString = createToken({ name: 'UnterminatedString', pattern: /"(?:[^"\\\n\r]|\\.)*/ })
export const Arrow = createToken({ name: 'Arrow', pattern: /<=>|⇌/, label: '<=>' })
/** Between an abbreviation's name and its formula: `abbreviation Cit = C6H5O7`. */
export const Equals = createToken({ name: 'Equals', pattern: '=', label: "'='" })
export const NumberLiteral = createToken({
  name: 'Number',
  pattern: /-?(?:10\^-?\d+(?:\.\d+)?|\d+(?:\.\d*)?(?:[eE][+-]?\d+)?|\.\d+(?:[eE][+-]?\d+)?)/,
  label: 'a number',
})

/** Longest first, so a regex alternation never stops at a shorter spelling. */
const longestFirst = <T extends string>(list: readonly T[]): T[] => [...list].sort((a, b) => b.length - a.length)
// The units and where they may stand come from units.ts, the one table of units.
const lowerUnits = longestFirst(UNIT_SPELLINGS.filter((u) => !UNITS_AFTER_NUMBER_ONLY.has(u)))
const upperUnits = longestFirst(UNIT_SPELLINGS.filter((u) => UNITS_AFTER_NUMBER_ONLY.has(u)))
const escape = (s: string) => s.replace(/[/^$.*+?()[\]{}|\\]/g, '\\$&')
const unitAfterNumber = new RegExp(`(?:${[...lowerUnits, ...upperUnits].map(escape).join('|')})(?![A-Za-z0-9_/()^+\\-·:])`, 'y')
const unitAnywhere = new RegExp(`(?:${lowerUnits.map(escape).join('|')})(?![A-Za-z0-9_/()^+\\-·:])`, 'y')

function lastTokenIs(tokens: IToken[], type: TokenType): boolean {
  const last = tokens[tokens.length - 1]
  return last !== undefined && last.tokenType === type
}

function stickyExec(re: RegExp, text: string, offset: number): RegExpExecArray | null {
  re.lastIndex = offset
  return re.exec(text)
}

/** A unit; upper-case units (M, C, K, Pa, J/mol) and lengths (Å, pm, nm) only directly after a number. */
export const Unit = createToken({
  name: 'Unit',
  pattern: {
    exec: (text: string, offset: number, tokens: IToken[]) =>
      lastTokenIs(tokens, NumberLiteral) ? stickyExec(unitAfterNumber, text, offset) : stickyExec(unitAnywhere, text, offset),
  },
  line_breaks: false,
  start_chars_hint: [...new Set(UNIT_SPELLINGS.map((u) => u[0]!))],
  label: 'a unit',
})

// The kinds come from model.ts, the one list of constant kinds.
const lowerKinds = longestFirst(CONSTANT_KIND_LIST.filter((k) => !KINDS_AFTER_FORMULA_ONLY.has(k)))
const upperKinds = longestFirst(CONSTANT_KIND_LIST.filter((k) => KINDS_AFTER_FORMULA_ONLY.has(k)))
const kindAfterFormula = new RegExp(`(?:${[...lowerKinds, ...upperKinds].join('|')})(?![A-Za-z0-9_\\-()^+·:])`, 'y')
const kindAnywhere = new RegExp(`(?:${lowerKinds.join('|')})(?![A-Za-z0-9_\\-])`, 'y')

/** The kind of an equilibrium constant; `K`, `Ka`, `Ksp` only right after the last species of a reaction. */
export const ConstantKind = createToken({
  name: 'ConstantKind',
  pattern: {
    exec: (text: string, offset: number, tokens: IToken[]) =>
      // Formula is declared below; it is only read when the lexer runs.
      lastTokenIs(tokens, Formula) ? stickyExec(kindAfterFormula, text, offset) : stickyExec(kindAnywhere, text, offset),
  },
  line_breaks: false,
  start_chars_hint: ['l', 'p', 'b', 'K'],
  label: 'a constant kind (logK, pKa, pKsp, …)',
})

/** A lower-case word that is no keyword: a source key, or a misspelt keyword. */
export const Word = createToken({ name: 'Word', pattern: /[a-z][A-Za-z0-9_\-]*/, label: 'a word' })

function keyword(name: string, word: string): TokenType {
  return createToken({ name, pattern: word, longer_alt: Word, label: `'${word}'` })
}

export const SystemKeyword = keyword('SystemKeyword', 'system')
export const TemperatureKeyword = keyword('TemperatureKeyword', 'temperature')
export const ActivityKeyword = keyword('ActivityKeyword', 'activity')
export const IonicStrengthKeyword = keyword('IonicStrengthKeyword', 'ionic-strength')
export const IonSizeKeyword = keyword('IonSizeKeyword', 'ion-size')
export const ComponentKeyword = keyword('ComponentKeyword', 'component')
export const ReactionKeyword = keyword('ReactionKeyword', 'reaction')
export const SolidKeyword = keyword('SolidKeyword', 'solid')
export const SourceKeyword = keyword('SourceKeyword', 'source')
export const UseKeyword = keyword('UseKeyword', 'use')
export const SweepKeyword = keyword('SweepKeyword', 'sweep')
export const TotalKeyword = keyword('TotalKeyword', 'total')
export const FreeKeyword = keyword('FreeKeyword', 'free')
export const PHKeyword = keyword('PHKeyword', 'pH')
export const PressureKeyword = keyword('PressureKeyword', 'pressure')
export const BalanceKeyword = keyword('BalanceKeyword', 'balance')
export const ExcessKeyword = keyword('ExcessKeyword', 'excess')
export const SuppressedKeyword = keyword('SuppressedKeyword', 'suppressed')
export const IdealKeyword = keyword('IdealKeyword', 'ideal')
export const DaviesKeyword = keyword('DaviesKeyword', 'davies')
export const DebyeHuckelKeyword = keyword('DebyeHuckelKeyword', 'debye-huckel')
export const EnthalpyKeyword = keyword('EnthalpyKeyword', 'dH')
export const CiteKeyword = keyword('CiteKeyword', 'cite')
export const FromKeyword = keyword('FromKeyword', 'from')
export const ToKeyword = keyword('ToKeyword', 'to')
export const StepKeyword = keyword('StepKeyword', 'step')
export const PointsKeyword = keyword('PointsKeyword', 'points')
export const LogKeyword = keyword('LogKeyword', 'log')
export const LimitKeyword = keyword('LimitKeyword', 'limit')
export const DissolvedKeyword = keyword('DissolvedKeyword', 'dissolved')
export const SampleKeyword = keyword('SampleKeyword', 'sample')
export const VolumeKeyword = keyword('VolumeKeyword', 'volume')
export const TitrantKeyword = keyword('TitrantKeyword', 'titrant')
export const TitrateKeyword = keyword('TitrateKeyword', 'titrate')
export const AbbreviationKeyword = keyword('AbbreviationKeyword', 'abbreviation')
/** `fit` after a reaction's constant: the constant is to be fitted to measured data. */
export const FitKeyword = keyword('FitKeyword', 'fit')
export const MapKeyword = keyword('MapKeyword', 'map')
export const ByKeyword = keyword('ByKeyword', 'by')
/** `uncertainty draws N [seed S]`: the Monte Carlo of a sweep or titration. */
export const UncertaintyKeyword = keyword('UncertaintyKeyword', 'uncertainty')
export const DrawsKeyword = keyword('DrawsKeyword', 'draws')
export const SeedKeyword = keyword('SeedKeyword', 'seed')

/** A chemical formula: starts with an upper-case letter; its inside is checked by formula.ts. */
export const Formula = createToken({
  name: 'Formula',
  pattern: /[A-Z][A-Za-z0-9()[\]·:^+\-⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻₀₁₂₃₄₅₆₇₈₉]*/,
  label: 'a formula',
})
export const Plus = createToken({ name: 'Plus', pattern: '+', label: "'+'" })
/** What may stand before a constant's uncertainty: `±`, or `+-` in plain ASCII. */
export const UNCERTAINTY_SIGNS: string[] = ['±', '+-']
export const PlusMinus = createToken({ name: 'PlusMinus', pattern: new RegExp(UNCERTAINTY_SIGNS.map(escape).join('|')), label: "'±' (or +-)" })
export const At = createToken({ name: 'At', pattern: '@', label: "'@'" })

export const KEYWORD_TOKENS: TokenType[] = [
  SystemKeyword, TemperatureKeyword, ActivityKeyword, IonicStrengthKeyword, IonSizeKeyword, ComponentKeyword,
  ReactionKeyword, SolidKeyword, SourceKeyword, UseKeyword, SweepKeyword, TotalKeyword, FreeKeyword,
  PHKeyword, PressureKeyword, BalanceKeyword, ExcessKeyword, SuppressedKeyword, IdealKeyword,
  DaviesKeyword, DebyeHuckelKeyword, EnthalpyKeyword, CiteKeyword, FromKeyword, ToKeyword,
  StepKeyword, PointsKeyword, LogKeyword, LimitKeyword, DissolvedKeyword,
  SampleKeyword, VolumeKeyword, TitrantKeyword, TitrateKeyword, AbbreviationKeyword, FitKeyword, MapKeyword, ByKeyword,
  UncertaintyKeyword, DrawsKeyword, SeedKeyword,
]

/** Order matters: the first pattern that matches wins (keywords before Word, units before Formula). */
export const allTokens: TokenType[] = [
  Comment, Newline, Whitespace, StringLiteral, UnterminatedString, Arrow, Equals, NumberLiteral, Unit,
  ConstantKind, ...KEYWORD_TOKENS, Word, Formula, PlusMinus, Plus, At,
]

/** Words offered by completion. */
export const KEYWORDS: string[] = KEYWORD_TOKENS.map((t) => String(t.PATTERN))
/** The ångström sign (U+212B) reads like the letter Å but is not offered twice. */
export const UNITS: string[] = [...UNIT_SPELLINGS].filter((u) => u !== 'Å')
export const CONSTANT_KINDS: string[] = [...CONSTANT_KIND_LIST]
