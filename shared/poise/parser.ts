/**
 * The Poise grammar, one statement at a time (the compiler hands the parser
 * one line's tokens, so a mistake on one line never hides the others).
 * The parser is built once (a singleton): building it costs far more than
 * parsing a file. grammar/diagrams.html is generated from this grammar.
 */
import { CstParser, EOF, type CstNode, type IParserErrorMessageProvider, type IToken, type TokenType } from 'chevrotain'
import * as T from './tokens'

function describe(token: IToken | undefined): string {
  return !token || token.tokenType === EOF ? 'the end of the line' : `'${token.image}'`
}

function labelOf(type: TokenType): string {
  return type.LABEL ?? type.name
}

function alternatives(paths: TokenType[][][]): string {
  const firsts = new Set<string>()
  for (const alt of paths) for (const path of alt) if (path[0]) firsts.add(labelOf(path[0]))
  const list = [...firsts]
  return list.length <= 1 ? (list[0] ?? 'something else') : `${list.slice(0, -1).join(', ')} or ${list[list.length - 1]}`
}

const RULE_NAMES: Record<string, string> = {
  statement: 'a statement (system, temperature, activity, ionic-strength, ion-size, abbreviation, component, reaction, solid, source, use, sweep, map, limit, sample volume, titrant, titrate or uncertainty)',
  componentSpec: 'a component spec (total, free, pH, pressure, balance or excess)',
  sweepVariable: 'a sweep variable (pH, total F, temperature or pressure F)',
  titrateStatement: "'from A to B' or 'to pH X' after titrate",
}

const messages: IParserErrorMessageProvider = {
  buildMismatchTokenMessage: ({ expected, actual, previous }) =>
    `expected ${labelOf(expected)}${previous && previous.tokenType !== EOF && previous.image ? ` after '${previous.image}'` : ''}, found ${describe(actual)}`,
  buildNotAllInputParsedMessage: ({ firstRedundant }) =>
    firstRedundant.tokenType === T.Word
      ? `'${firstRedundant.image}' is not a keyword here: check its spelling (one statement a line; comments start with #)`
      : `unexpected ${describe(firstRedundant)}: one statement a line, and nothing after its end (comments start with #)`,
  buildNoViableAltMessage: ({ expectedPathsPerAlt, actual, previous, ruleName }) =>
    `expected ${RULE_NAMES[ruleName] ?? alternatives(expectedPathsPerAlt)}${previous && previous.tokenType !== EOF && previous.image ? ` after '${previous.image}'` : ''}, found ${describe(actual[0]!)}`,
  buildEarlyExitMessage: ({ expectedIterationPaths, actual }) =>
    `expected ${alternatives([expectedIterationPaths])}, found ${describe(actual[0]!)}`,
}

// Every closure handed to the DSL is created once, as a field, rather than on
// each call of a rule: creating closures per call dominated parsing time.
class PoiseParser extends CstParser {
  private readonly statementAlts = [
    { ALT: () => this.SUBRULE(this.systemStatement) },
    { ALT: () => this.SUBRULE(this.temperatureStatement) },
    { ALT: () => this.SUBRULE(this.activityStatement) },
    { ALT: () => this.SUBRULE(this.ionicStrengthStatement) },
    { ALT: () => this.SUBRULE(this.ionSizeStatement) },
    { ALT: () => this.SUBRULE(this.abbreviationStatement) },
    { ALT: () => this.SUBRULE(this.componentStatement) },
    { ALT: () => this.SUBRULE(this.reactionStatement) },
    { ALT: () => this.SUBRULE(this.solidStatement) },
    { ALT: () => this.SUBRULE(this.sourceStatement) },
    { ALT: () => this.SUBRULE(this.useStatement) },
    { ALT: () => this.SUBRULE(this.sweepStatement) },
    { ALT: () => this.SUBRULE(this.mapStatement) },
    { ALT: () => this.SUBRULE(this.limitStatement) },
    { ALT: () => this.SUBRULE(this.sampleVolumeStatement) },
    { ALT: () => this.SUBRULE(this.titrantStatement) },
    { ALT: () => this.SUBRULE(this.titrateStatement) },
    { ALT: () => this.SUBRULE(this.uncertaintyStatement) },
  ]
  private readonly activityAlts = [
    { ALT: () => this.CONSUME(T.IdealKeyword) },
    { ALT: () => this.CONSUME(T.DaviesKeyword) },
    { ALT: () => this.CONSUME(T.DebyeHuckelKeyword) },
  ]
  private readonly specAlts = [
    { ALT: () => { this.CONSUME(T.TotalKeyword); this.SUBRULE1(this.quantity) } },
    { ALT: () => { this.CONSUME(T.FreeKeyword); this.SUBRULE2(this.quantity) } },
    { ALT: () => { this.CONSUME(T.PHKeyword); this.CONSUME(T.NumberLiteral) } },
    { ALT: () => { this.CONSUME(T.PressureKeyword); this.SUBRULE3(this.quantity) } },
    { ALT: () => this.CONSUME(T.BalanceKeyword) },
    { ALT: () => this.CONSUME(T.ExcessKeyword) },
  ]
  private readonly optionalSpec = () => this.SUBRULE(this.componentSpec)
  private readonly reactionExtraAlts = [
    { ALT: () => this.SUBRULE(this.enthalpy) },
    { ALT: () => this.SUBRULE(this.citation) },
    { ALT: () => this.CONSUME(T.FitKeyword) },
  ]
  private readonly reactionExtra = () => this.OR(this.reactionExtraAlts)
  private readonly moreTerms = () => {
    this.CONSUME(T.Plus)
    this.SUBRULE2(this.term)
  }
  private readonly coefficient = () => this.CONSUME(T.NumberLiteral)
  // A source key may be the word `fit` (it was a plain word before `fit` became a keyword).
  private readonly citationAlts = [
    { ALT: () => this.CONSUME(T.StringLiteral) },
    { ALT: () => this.CONSUME(T.Word) },
    { ALT: () => this.CONSUME(T.Formula) },
    { ALT: () => this.CONSUME(T.FitKeyword) },
  ]
  private readonly sourceKeyAlts = [
    { ALT: () => this.CONSUME(T.Word) },
    { ALT: () => this.CONSUME(T.Formula) },
    { ALT: () => this.CONSUME(T.FitKeyword) },
  ]
  private readonly seed = () => {
    this.CONSUME(T.SeedKeyword)
    this.CONSUME2(T.NumberLiteral)
  }
  private readonly uncertainty = () => {
    this.CONSUME(T.PlusMinus)
    this.CONSUME2(T.NumberLiteral)
  }
  private readonly revision = () => {
    this.CONSUME(T.At)
    this.CONSUME(T.NumberLiteral)
  }
  private readonly sweepSpacingAlts = [
    { ALT: () => { this.CONSUME(T.StepKeyword); this.SUBRULE3(this.quantity) } },
    { ALT: () => { this.CONSUME(T.PointsKeyword); this.CONSUME(T.NumberLiteral) } },
  ]
  private readonly logSpacing = () => this.CONSUME(T.LogKeyword)
  private readonly sweepVariableAlts = [
    { ALT: () => this.CONSUME(T.PHKeyword) },
    { ALT: () => { this.CONSUME(T.TotalKeyword); this.CONSUME1(T.Formula) } },
    { ALT: () => this.CONSUME(T.TemperatureKeyword) },
    { ALT: () => { this.CONSUME(T.PressureKeyword); this.CONSUME2(T.Formula) } },
  ]
  private readonly optionalUnit = () => this.CONSUME(T.Unit)
  private readonly titrateSpacingAlts = [
    { ALT: () => { this.CONSUME2(T.StepKeyword); this.SUBRULE6(this.quantity) } },
    { ALT: () => { this.CONSUME2(T.PointsKeyword); this.CONSUME2(T.NumberLiteral) } },
  ]
  private readonly titrateAlts = [
    {
      ALT: () => {
        this.CONSUME(T.FromKeyword)
        this.SUBRULE4(this.quantity)
        this.CONSUME1(T.ToKeyword)
        this.SUBRULE5(this.quantity)
        this.OR1(this.titrateSpacingAlts)
      },
    },
    { ALT: () => { this.CONSUME2(T.ToKeyword); this.CONSUME(T.PHKeyword); this.CONSUME1(T.NumberLiteral) } },
  ]

  constructor() {
    super(T.allTokens, { recoveryEnabled: true, errorMessageProvider: messages, maxLookahead: 2 })
    this.performSelfAnalysis()
  }

  public statement = this.RULE('statement', () => {
    this.OR(this.statementAlts)
  })

  private systemStatement = this.RULE('systemStatement', () => {
    this.CONSUME(T.SystemKeyword)
    this.CONSUME(T.StringLiteral)
  })

  private temperatureStatement = this.RULE('temperatureStatement', () => {
    this.CONSUME(T.TemperatureKeyword)
    this.SUBRULE(this.quantity)
  })

  private activityStatement = this.RULE('activityStatement', () => {
    this.CONSUME(T.ActivityKeyword)
    this.OR(this.activityAlts)
  })

  private ionicStrengthStatement = this.RULE('ionicStrengthStatement', () => {
    this.CONSUME(T.IonicStrengthKeyword)
    this.SUBRULE(this.quantity)
  })

  private ionSizeStatement = this.RULE('ionSizeStatement', () => {
    this.CONSUME(T.IonSizeKeyword)
    this.CONSUME(T.Formula)
    this.SUBRULE(this.quantity)
  })

  /** `abbreviation NAME = FORMULA`: a group of atoms named once, written inside later formulas. */
  private abbreviationStatement = this.RULE('abbreviationStatement', () => {
    this.CONSUME(T.AbbreviationKeyword)
    this.CONSUME1(T.Formula)
    this.CONSUME(T.Equals)
    this.CONSUME2(T.Formula)
  })

  private componentStatement = this.RULE('componentStatement', () => {
    this.CONSUME(T.ComponentKeyword)
    this.CONSUME(T.Formula)
    this.OPTION(this.optionalSpec)
  })

  private componentSpec = this.RULE('componentSpec', () => {
    this.OR(this.specAlts)
  })

  private reactionStatement = this.RULE('reactionStatement', () => {
    this.CONSUME(T.ReactionKeyword)
    this.SUBRULE1(this.reactionSide)
    this.CONSUME(T.Arrow)
    this.SUBRULE2(this.reactionSide)
    this.SUBRULE(this.constant)
    this.MANY(this.reactionExtra)
  })

  private reactionSide = this.RULE('reactionSide', () => {
    this.SUBRULE1(this.term)
    this.MANY(this.moreTerms)
  })

  private term = this.RULE('term', () => {
    this.OPTION(this.coefficient)
    this.CONSUME(T.Formula)
  })

  /** `KIND N [± S]`: the ± is the standard uncertainty, in the kind's own units. */
  private constant = this.RULE('constant', () => {
    this.CONSUME(T.ConstantKind)
    this.CONSUME(T.NumberLiteral)
    this.OPTION(this.uncertainty)
  })

  private enthalpy = this.RULE('enthalpy', () => {
    this.CONSUME(T.EnthalpyKeyword)
    this.SUBRULE(this.quantity)
  })

  private citation = this.RULE('citation', () => {
    this.CONSUME(T.CiteKeyword)
    this.OR(this.citationAlts)
  })

  private solidStatement = this.RULE('solidStatement', () => {
    this.CONSUME(T.SolidKeyword)
    this.CONSUME(T.Formula)
    this.CONSUME(T.SuppressedKeyword)
  })

  private sourceStatement = this.RULE('sourceStatement', () => {
    this.CONSUME(T.SourceKeyword)
    this.OR(this.sourceKeyAlts)
    this.CONSUME(T.StringLiteral)
  })

  private useStatement = this.RULE('useStatement', () => {
    this.CONSUME(T.UseKeyword)
    this.CONSUME(T.StringLiteral)
    this.OPTION(this.revision)
  })

  private sweepStatement = this.RULE('sweepStatement', () => {
    this.CONSUME(T.SweepKeyword)
    this.SUBRULE(this.sweepVariable)
    this.CONSUME(T.FromKeyword)
    this.SUBRULE1(this.quantity)
    this.CONSUME(T.ToKeyword)
    this.SUBRULE2(this.quantity)
    this.OR(this.sweepSpacingAlts)
    this.OPTION(this.logSpacing)
  })

  /** `map AXIS by AXIS`: a sweep with a second axis (x after `map`, y after `by`). */
  private mapStatement = this.RULE('mapStatement', () => {
    this.CONSUME(T.MapKeyword)
    this.SUBRULE1(this.mapAxis)
    this.CONSUME(T.ByKeyword)
    this.SUBRULE2(this.mapAxis)
  })

  /** One axis of a map, written as a sweep is: `VARIABLE from A to B (step D | points N) [log]`. */
  private mapAxis = this.RULE('mapAxis', () => {
    this.SUBRULE(this.sweepVariable)
    this.CONSUME(T.FromKeyword)
    this.SUBRULE1(this.quantity)
    this.CONSUME(T.ToKeyword)
    this.SUBRULE2(this.quantity)
    this.OR(this.sweepSpacingAlts)
    this.OPTION(this.logSpacing)
  })

  /** `limit dissolved X N UNIT`: X an element symbol (Ni) or a component (Ni^2+). */
  private limitStatement = this.RULE('limitStatement', () => {
    this.CONSUME(T.LimitKeyword)
    this.CONSUME(T.DissolvedKeyword)
    this.CONSUME(T.Formula)
    this.SUBRULE(this.quantity)
  })

  /** `sample volume N UNIT`: the volume titrated. */
  private sampleVolumeStatement = this.RULE('sampleVolumeStatement', () => {
    this.CONSUME(T.SampleKeyword)
    this.CONSUME(T.VolumeKeyword)
    this.SUBRULE(this.quantity)
  })

  /** `titrant F N UNIT`: one species of the titrant and its concentration. */
  private titrantStatement = this.RULE('titrantStatement', () => {
    this.CONSUME(T.TitrantKeyword)
    this.CONSUME(T.Formula)
    this.SUBRULE(this.quantity)
  })

  /** `titrate from A to B (step D | points N)` or `titrate to pH X`. */
  private titrateStatement = this.RULE('titrateStatement', () => {
    this.CONSUME(T.TitrateKeyword)
    this.OR(this.titrateAlts)
  })

  /** `uncertainty draws N [seed S]`: constants drawn N times for the bands of a sweep or titration. */
  private uncertaintyStatement = this.RULE('uncertaintyStatement', () => {
    this.CONSUME(T.UncertaintyKeyword)
    this.CONSUME(T.DrawsKeyword)
    this.CONSUME1(T.NumberLiteral)
    this.OPTION(this.seed)
  })

  private sweepVariable = this.RULE('sweepVariable', () => {
    this.OR(this.sweepVariableAlts)
  })

  private quantity = this.RULE('quantity', () => {
    this.CONSUME(T.NumberLiteral)
    this.OPTION(this.optionalUnit)
  })
}

/** The one parser instance; chevrotain parsers are reusable by resetting `input`. */
export const poiseParser = new PoiseParser()

export interface ParsedLine { cst: CstNode | null; errors: { message: string; token: IToken }[] }

export function parseStatement(tokens: IToken[]): ParsedLine {
  poiseParser.input = tokens
  const cst = poiseParser.statement()
  const errors = poiseParser.errors.map((e) => ({ message: e.message, token: e.token }))
  return { cst: errors.length ? null : cst, errors }
}
