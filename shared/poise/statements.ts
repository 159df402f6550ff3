/**
 * From text to statements: lexes once, parses each line on its own, and turns
 * the concrete syntax tree of each well-formed line into a small typed
 * statement the checker works on.
 */
import type { CstElement, CstNode, IToken } from 'chevrotain'
import type { Fix } from './diagnostics'
import { lexForParser } from './lexer'
import { parseStatement } from './parser'
import { editDistance, nearness, notAUnitMessage, parseNumber, quantityDimensions, suggestUnits, type Dimension } from './units'
import { KEYWORDS } from './tokens'
import { formatNumber, NUMBER_MAX, NUMBER_MIN } from './limits'

export interface Tok { image: string; from: number; to: number }
export interface Quantity { value: number; number: Tok; unit: Tok | null }
export interface Term { coefficient: number; coefficientTok: Tok | null; formula: Tok }

interface Base { from: number; to: number; keyword: Tok }
export type Statement = Base & (
  | { kind: 'system'; title: string; titleTok: Tok }
  | { kind: 'temperature'; quantity: Quantity }
  | { kind: 'activity'; model: 'ideal' | 'davies' | 'debye-huckel' }
  | { kind: 'ionicStrength'; quantity: Quantity }
  | { kind: 'ionSize'; formula: Tok; quantity: Quantity }
  | { kind: 'abbreviation'; name: Tok; formula: Tok }
  | { kind: 'component'; formula: Tok; spec: { mode: 'total' | 'free' | 'pH' | 'pressure' | 'balance' | 'excess'; tok: Tok; quantity: Quantity | null } | null }
  | { kind: 'reaction'; left: Term[]; right: Term[]; arrow: Tok; constantKind: Tok; constantValue: Quantity; uncertainty: { sign: Tok; quantity: Quantity } | null; fits: Tok[]; enthalpies: { tok: Tok; quantity: Quantity }[]; cites: { tok: Tok; text: string | null; key: Tok | null }[] }
  | { kind: 'solid'; formula: Tok }
  | { kind: 'source'; key: Tok; text: string }
  | { kind: 'use'; name: string; nameTok: Tok; revision: Quantity | null }
  | { kind: 'limit'; dissolved: Tok; target: Tok; quantity: Quantity }
  | { kind: 'sampleVolume'; volume: Tok; quantity: Quantity }
  | { kind: 'titrant'; formula: Tok; quantity: Quantity }
  | { kind: 'uncertainty'; draws: Quantity; seed: Quantity | null }
  | { kind: 'titrate'; start: Quantity | null; end: Quantity | null; step: Quantity | null; points: Quantity | null; targetPH: Quantity | null }
  | ({ kind: 'sweep' } & SweepAxis)
  | { kind: 'map'; x: SweepAxis; y: SweepAxis; by: Tok }
)

/** What a `sweep` line, and each axis of a `map` line, says: the variable, its ends and spacing (`from`/`to`: the span of the axis). */
export interface SweepAxis {
  from: number
  to: number
  variable: 'pH' | 'total' | 'temperature' | 'pressure'
  variableTok: Tok
  target: Tok | null
  start: Quantity
  end: Quantity
  step: Quantity | null
  points: Quantity | null
  log: boolean
}

export interface SyntaxProblem { code: 'P001' | 'P002' | 'P050' | 'P082'; message: string; from: number; to: number; fixes?: Fix[] }

const tok = (t: IToken): Tok => ({ image: t.image, from: t.startOffset, to: t.startOffset + t.image.length })

function isNode(e: CstElement | undefined): e is CstNode {
  return e !== undefined && 'children' in e
}
function node(n: CstNode, key: string, i = 0): CstNode {
  const e = n.children[key]?.[i]
  if (!isNode(e)) throw new Error(`internal: missing rule ${key}`)
  return e
}
function token(n: CstNode, key: string, i = 0): IToken {
  const e = n.children[key]?.[i]
  if (e === undefined || isNode(e)) throw new Error(`internal: missing token ${key}`)
  return e
}
function maybeToken(n: CstNode, key: string): IToken | null {
  const e = n.children[key]?.[0]
  return e !== undefined && !isNode(e) ? e : null
}
function nodes(n: CstNode, key: string): CstNode[] {
  return (n.children[key] ?? []).filter(isNode)
}

/** Unquotes a string literal, reading `\"` and `\\` escapes. */
function unquote(image: string): string {
  return image.slice(1, -1).replace(/\\(.)/g, '$1')
}

function quantity(n: CstNode): Quantity {
  const num = token(n, 'Number')
  const unit = maybeToken(n, 'Unit')
  return { value: parseNumber(num.image), number: tok(num), unit: unit ? tok(unit) : null }
}

function numberQuantity(t: IToken): Quantity {
  return { value: parseNumber(t.image), number: tok(t), unit: null }
}

/** A sweep's variable, ends and spacing: the `sweep` statement's own node or a map's `mapAxis` node. */
function sweepAxis(n: CstNode): SweepAxis {
  const v = node(n, 'sweepVariable')
  const vKey = Object.keys(v.children).find((k) => k.endsWith('Keyword'))!
  const vTok = token(v, vKey)
  const qs = nodes(n, 'quantity')
  const pts = maybeToken(n, 'Number')
  const target = maybeToken(v, 'Formula')
  const log = maybeToken(n, 'LogKeyword')
  const variable = vTok.image === 'pH' ? 'pH' : (vTok.image as 'total' | 'temperature' | 'pressure')
  const step = qs[2] ? quantity(qs[2]) : null
  const points = pts ? numberQuantity(pts) : null
  const last = log ? tok(log) : points ? points.number : (step!.unit ?? step!.number)
  return {
    from: vTok.startOffset, to: last.to, variable, variableTok: tok(vTok), target: target ? tok(target) : null,
    start: quantity(qs[0]!), end: quantity(qs[1]!), step, points, log: log !== null,
  }
}

function terms(side: CstNode): Term[] {
  return nodes(side, 'term').map((t) => {
    const c = maybeToken(t, 'Number')
    return { coefficient: c ? parseNumber(c.image) : 1, coefficientTok: c ? tok(c) : null, formula: tok(token(t, 'Formula')) }
  })
}

function toStatement(cst: CstNode, from: number, to: number): Statement {
  const inner = Object.values(cst.children)[0]![0] as CstNode
  const kw = (name: string) => tok(token(inner, name))
  switch (inner.name) {
    case 'systemStatement': {
      const s = token(inner, 'String')
      return { kind: 'system', from, to, keyword: kw('SystemKeyword'), title: unquote(s.image), titleTok: tok(s) }
    }
    case 'temperatureStatement':
      return { kind: 'temperature', from, to, keyword: kw('TemperatureKeyword'), quantity: quantity(node(inner, 'quantity')) }
    case 'activityStatement': {
      const m = maybeToken(inner, 'IdealKeyword') ?? maybeToken(inner, 'DaviesKeyword') ?? token(inner, 'DebyeHuckelKeyword')
      return { kind: 'activity', from, to, keyword: kw('ActivityKeyword'), model: m.image as 'ideal' | 'davies' | 'debye-huckel' }
    }
    case 'ionicStrengthStatement':
      return { kind: 'ionicStrength', from, to, keyword: kw('IonicStrengthKeyword'), quantity: quantity(node(inner, 'quantity')) }
    case 'ionSizeStatement':
      return { kind: 'ionSize', from, to, keyword: kw('IonSizeKeyword'), formula: tok(token(inner, 'Formula')), quantity: quantity(node(inner, 'quantity')) }
    case 'abbreviationStatement':
      return { kind: 'abbreviation', from, to, keyword: kw('AbbreviationKeyword'), name: tok(token(inner, 'Formula', 0)), formula: tok(token(inner, 'Formula', 1)) }
    case 'componentStatement': {
      const specNode = nodes(inner, 'componentSpec')[0]
      let spec: Extract<Statement, { kind: 'component' }>['spec'] = null
      if (specNode) {
        const key = Object.keys(specNode.children).find((k) => k.endsWith('Keyword'))!
        const modeTok = token(specNode, key)
        const q = nodes(specNode, 'quantity')[0]
        const num = maybeToken(specNode, 'Number')
        spec = { mode: modeTok.image as 'total', tok: tok(modeTok), quantity: q ? quantity(q) : num ? numberQuantity(num) : null }
      }
      return { kind: 'component', from, to, keyword: kw('ComponentKeyword'), formula: tok(token(inner, 'Formula')), spec }
    }
    case 'reactionStatement': {
      const sides = nodes(inner, 'reactionSide')
      const k = node(inner, 'constant')
      return {
        kind: 'reaction', from, to, keyword: kw('ReactionKeyword'),
        left: terms(sides[0]!), right: terms(sides[1]!), arrow: tok(token(inner, 'Arrow')),
        constantKind: tok(token(k, 'ConstantKind')), constantValue: numberQuantity(token(k, 'Number')),
        uncertainty: maybeToken(k, 'PlusMinus') ? { sign: tok(token(k, 'PlusMinus')), quantity: numberQuantity(token(k, 'Number', 1)) } : null,
        fits: (inner.children.FitKeyword ?? []).filter((e) => !isNode(e)).map((e) => tok(e as IToken)),
        enthalpies: nodes(inner, 'enthalpy').map((e) => ({ tok: tok(token(e, 'EnthalpyKeyword')), quantity: quantity(node(e, 'quantity')) })),
        cites: nodes(inner, 'citation').map((e) => {
          const s = maybeToken(e, 'String')
          const key = maybeToken(e, 'Word') ?? maybeToken(e, 'Formula') ?? maybeToken(e, 'FitKeyword')
          return { tok: tok(token(e, 'CiteKeyword')), text: s ? unquote(s.image) : null, key: key ? tok(key) : null }
        }),
      }
    }
    case 'solidStatement':
      return { kind: 'solid', from, to, keyword: kw('SolidKeyword'), formula: tok(token(inner, 'Formula')) }
    case 'sourceStatement': {
      const key = maybeToken(inner, 'Word') ?? maybeToken(inner, 'FitKeyword') ?? token(inner, 'Formula')
      return { kind: 'source', from, to, keyword: kw('SourceKeyword'), key: tok(key), text: unquote(token(inner, 'String').image) }
    }
    case 'useStatement': {
      const s = token(inner, 'String')
      const rev = maybeToken(inner, 'Number')
      return { kind: 'use', from, to, keyword: kw('UseKeyword'), name: unquote(s.image), nameTok: tok(s), revision: rev ? numberQuantity(rev) : null }
    }
    case 'limitStatement':
      return {
        kind: 'limit', from, to, keyword: kw('LimitKeyword'), dissolved: kw('DissolvedKeyword'),
        target: tok(token(inner, 'Formula')), quantity: quantity(node(inner, 'quantity')),
      }
    case 'sampleVolumeStatement':
      return { kind: 'sampleVolume', from, to, keyword: kw('SampleKeyword'), volume: kw('VolumeKeyword'), quantity: quantity(node(inner, 'quantity')) }
    case 'titrantStatement':
      return { kind: 'titrant', from, to, keyword: kw('TitrantKeyword'), formula: tok(token(inner, 'Formula')), quantity: quantity(node(inner, 'quantity')) }
    case 'uncertaintyStatement': {
      const seed = maybeToken(inner, 'SeedKeyword') ? numberQuantity(token(inner, 'Number', 1)) : null
      return { kind: 'uncertainty', from, to, keyword: kw('UncertaintyKeyword'), draws: numberQuantity(token(inner, 'Number', 0)), seed }
    }
    case 'titrateStatement': {
      const keyword = kw('TitrateKeyword')
      if (maybeToken(inner, 'PHKeyword')) {
        return { kind: 'titrate', from, to, keyword, start: null, end: null, step: null, points: null, targetPH: numberQuantity(token(inner, 'Number')) }
      }
      const qs = nodes(inner, 'quantity')
      const pts = maybeToken(inner, 'Number')
      return {
        kind: 'titrate', from, to, keyword, start: quantity(qs[0]!), end: quantity(qs[1]!),
        step: qs[2] ? quantity(qs[2]) : null, points: pts ? numberQuantity(pts) : null, targetPH: null,
      }
    }
    case 'sweepStatement':
      return { kind: 'sweep', keyword: kw('SweepKeyword'), ...sweepAxis(inner), from, to } as Statement
    case 'mapStatement': {
      const [x, y] = nodes(inner, 'mapAxis')
      return { kind: 'map', from, to, keyword: kw('MapKeyword'), by: kw('ByKeyword'), x: sweepAxis(x!), y: sweepAxis(y!) }
    }
  }
  throw new Error(`internal: unknown statement ${inner.name}`)
}

export interface ParsedFile {
  statements: Statement[]
  problems: SyntaxProblem[]
  incomplete: boolean
  /**
   * The lines that did not parse (their own error says why; later checks must
   * not cascade from them): the line's first word, and the word or formula
   * after it (the name it declares, as in `component NH3 …` or `source hb …`).
   */
  brokenLines: { keyword: string; name: string | null }[]
}

/** Lexes and parses a whole file. Lines with a syntax error yield a problem and no statement. */
export function parseFile(text: string): ParsedFile {
  const lexed = lexForParser(text)
  const problems: SyntaxProblem[] = lexed.errors.map((e) => ({ code: 'P001', message: e.message, from: e.from, to: e.to }))
  const statements: Statement[] = []
  const brokenLines: ParsedFile['brokenLines'] = []
  const unitSpans: { from: number; to: number }[] = []
  let incomplete = problems.length > 0
  let line: IToken[] = []
  const flush = (lineEnd: number) => {
    const before = statements.length
    const unterminated = line.find((t) => t.tokenType.name === 'UnterminatedString')
    if (unterminated) {
      problems.push({ code: 'P001', message: 'this text has no closing quote: add " at its end', from: unterminated.startOffset, to: unterminated.startOffset + unterminated.image.length })
      incomplete = true
    } else if (line.length > 0 && !unrepresentable(line)) {
      const parsed = parseStatement(line)
      const from = line[0]!.startOffset
      const last = line[line.length - 1]!
      const to = last.startOffset + last.image.length
      if (parsed.cst) statements.push(toStatement(parsed.cst, from, to))
      else {
        // Every error the parser recovered from, once each; a word after a number that is no unit gets its own message.
        // An error at the token right after the previous one is that one's echo (the parser resynchronising): not reported.
        const seen = new Set<number>()
        let previous = -2
        for (const e of parsed.errors) {
          const at = Number.isFinite(e.token.startOffset) ? e.token.startOffset : lineEnd
          const index = Number.isFinite(e.token.startOffset) ? line.indexOf(e.token) : line.length
          const echo = index === previous + 1
          previous = index
          if (echo || seen.has(at) || unitSpans.some((s) => at >= s.from && at < s.to)) continue
          seen.add(at)
          const unit = notAUnit(e.token)
          if (unit) { problems.push(unit); unitSpans.push(unit); continue }
          const end = Number.isFinite(e.token.startOffset) ? at + Math.max(1, e.token.image.length) : lineEnd
          problems.push({ code: 'P002', message: e.message, from: Math.min(at, text.length), to: Math.min(Math.max(end, at), text.length) })
        }
        incomplete = true
      }
    }
    if (statements.length === before && line.length > 0) {
      const second = line[1]
      brokenLines.push({ keyword: line[0]!.image, name: second && ['Word', 'Formula'].includes(second.tokenType.name) ? second.image : null })
    }
    line = []
  }
  /** The quantities a unit at line[k] may be of, from the keyword before its number or the statement's keyword; [] when not known. */
  function dimensionsAt(k: number): Dimension[] {
    // line[k] is the word after the number at k - 1.
    return quantityDimensions(line.map((t) => t.image), k - 1)
  }
  /** A word right after a number where the parser expected something else: a unit that is not one (P050), with the nearest units. */
  function notAUnit(tok: IToken): SyntaxProblem | null {
    const k = line.indexOf(tok)
    if (k < 1 || line[k - 1]!.tokenType.name !== 'Number' || !['Word', 'Formula'].includes(tok.tokenType.name)) return null
    // The whole run of text up to the next space: mg/l lexes as a word, an unexpected '/' and another word.
    const run = /[^\s#]*/y
    run.lastIndex = tok.startOffset
    const word = run.exec(text)![0]
    const s = suggestUnits(word, dimensionsAt(k))
    if (s.units.length === 0 || (s.how === 'near' && KEYWORDS.some((kw) => editDistance(word.toLowerCase(), kw.toLowerCase()) <= nearness(word)))) return null
    const from = tok.startOffset
    const to = from + word.length
    const fixes = s.clear ? [{ label: `write ${s.units[0]}`, from, to, insert: s.units[0]! }] : undefined
    return { code: 'P050', message: notAUnitMessage(word, s), from, to, ...(fixes ? { fixes } : {}) }
  }
  /** Reports the numbers of a line that double precision cannot carry; true when there is one (the line is then skipped). */
  function unrepresentable(tokens: IToken[]): boolean {
    let bad = false
    for (const t of tokens) {
      if (t.tokenType.name !== 'Number') continue
      const v = parseNumber(t.image)
      const tooLarge = !(Math.abs(v) <= NUMBER_MAX)
      const tooSmall = !tooLarge && v !== 0 && Math.abs(v) < NUMBER_MIN
      // A literal such as 0e5 or 0.000 is a true zero; 1e-400 only reads as one.
      if (!tooLarge && !tooSmall && !(v === 0 && /[1-9]/.test(t.image.replace(/[eE].*$/, '')))) continue
      problems.push({
        code: 'P082',
        message: `${t.image} is too ${tooLarge ? 'large' : 'small'} for Poise: a number must be 0 or between ${formatNumber(NUMBER_MIN)} and ${formatNumber(NUMBER_MAX)} in size (and each quantity has its own, narrower range)`,
        from: t.startOffset, to: t.startOffset + t.image.length,
      })
      bad = true
      incomplete = true
    }
    return bad
  }
  for (const t of lexed.tokens) {
    if (t.tokenType.name === 'Newline') flush(t.startOffset)
    else line.push(t)
  }
  const lastTok = line[line.length - 1]
  flush(lastTok ? lastTok.startOffset + lastTok.image.length : text.length)
  // Characters the lexer refused inside a word already reported as no unit (the '/' of mg/l) need no message of their own.
  const kept = problems.filter((p) => p.code !== 'P001' || !unitSpans.some((s) => p.from >= s.from && p.from < s.to))
  return { statements, problems: kept, incomplete, brokenLines }
}
