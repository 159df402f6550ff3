/**
 * The one table from the Poise lexer's token names to what the editor does
 * with them: the highlight tag, and the role completion reads to know where
 * the cursor stands. Because highlighting is keyed by the chevrotain token
 * name, the editor and the parser can never disagree about what a word is;
 * a unit test fails when the lexer gains a token this table does not name.
 */
import { tags, type Tag } from '@lezer/highlight'

/** What a token is for, as far as the editor's context logic cares. */
/** What a token is for, as far as the editor's context logic cares. */
export type TokenRole =
  | 'statement'
  | 'keyword'
  | 'constantKind'
  | 'unit'
  | 'formula'
  | 'number'
  | 'string'
  | 'word'
  | 'comment'
  | 'arrow'
  | 'plus'
  | 'plusMinus'
  | 'punctuation'
  | 'invalid'

export interface TokenStyle {
  tag: Tag
  role: TokenRole
}

const statement: TokenStyle = { tag: tags.definitionKeyword, role: 'statement' }
const keyword: TokenStyle = { tag: tags.keyword, role: 'keyword' }
const choice: TokenStyle = { tag: tags.atom, role: 'keyword' }

/**
 * Every token name of shared/poise/tokens.ts. `null` marks a token the
 * highlighter never receives (line breaks and skipped blanks), so that
 * leaving a token out is always a decision, never an accident.
 */
export const TOKEN_STYLES: Readonly<Record<string, TokenStyle | null>> = {
  Newline: null,
  Whitespace: null,
  Comment: { tag: tags.lineComment, role: 'comment' },
  String: { tag: tags.string, role: 'string' },
  UnterminatedString: { tag: tags.invalid, role: 'invalid' },
  Arrow: { tag: tags.operator, role: 'arrow' },
  Equals: { tag: tags.definitionOperator, role: 'punctuation' },
  Number: { tag: tags.number, role: 'number' },
  Unit: { tag: tags.unit, role: 'unit' },
  ConstantKind: { tag: tags.function(tags.name), role: 'constantKind' },
  SystemKeyword: statement,
  TemperatureKeyword: statement,
  ActivityKeyword: statement,
  IonicStrengthKeyword: statement,
  IonSizeKeyword: statement,
  ComponentKeyword: statement,
  ReactionKeyword: statement,
  SolidKeyword: statement,
  SourceKeyword: statement,
  UseKeyword: statement,
  SweepKeyword: statement,
  MapKeyword: statement,
  ByKeyword: keyword,
  LimitKeyword: statement,
  DissolvedKeyword: keyword,
  SampleKeyword: statement,
  VolumeKeyword: keyword,
  TitrantKeyword: statement,
  TitrateKeyword: statement,
  AbbreviationKeyword: statement,
  FitKeyword: keyword,
  UncertaintyKeyword: statement,
  DrawsKeyword: keyword,
  SeedKeyword: keyword,
  TotalKeyword: keyword,
  FreeKeyword: keyword,
  PHKeyword: keyword,
  PressureKeyword: keyword,
  BalanceKeyword: keyword,
  ExcessKeyword: keyword,
  SuppressedKeyword: keyword,
  IdealKeyword: choice,
  DaviesKeyword: choice,
  DebyeHuckelKeyword: choice,
  EnthalpyKeyword: keyword,
  CiteKeyword: keyword,
  FromKeyword: keyword,
  ToKeyword: keyword,
  StepKeyword: keyword,
  PointsKeyword: keyword,
  LogKeyword: keyword,
  Word: { tag: tags.labelName, role: 'word' },
  Formula: { tag: tags.typeName, role: 'formula' },
  Plus: { tag: tags.arithmeticOperator, role: 'plus' },
  PlusMinus: { tag: tags.arithmeticOperator, role: 'plusMinus' },
  At: { tag: tags.punctuation, role: 'punctuation' },
}

/** The same table as CodeMirror's StreamLanguage `tokenTable` wants it. */
export const POISE_TOKEN_TABLE: Readonly<Record<string, Tag>> = Object.fromEntries(
  Object.entries(TOKEN_STYLES).flatMap(([name, style]) => (style ? [[name, style.tag]] : [])),
)

/** Role of a token name; a name the table does not know counts as invalid text. */
export function roleOf(tokenName: string): TokenRole {
  return TOKEN_STYLES[tokenName]?.role ?? 'invalid'
}
