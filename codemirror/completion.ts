/**
 * Completion for Poise. Position decides what a word is (a unit follows a
 * number, a constant kind follows a reaction's last species), so the source
 * lexes the line up to the cursor and offers what may stand there. Every
 * word offered comes from the language's own lists (KEYWORDS, UNITS,
 * CONSTANT_KINDS) or from the last compile's symbols.
 */
import type { Completion, CompletionContext, CompletionResult } from '@codemirror/autocomplete'
import type { EditorState } from '@codemirror/state'
import type { PoiseSymbol } from '../shared/poise/index'
import { CONSTANT_KINDS, KEYWORDS, UNCERTAINTY_SIGNS, UNITS } from '../shared/poise/tokens'
import { unitInfo, type Dimension } from '../shared/poise/units'
import { poiseSymbolsField } from './analysis'
import { lexLine, type LineToken } from './language'

/** Words that open a statement, in the order a file usually has them. */
const STATEMENT_WORDS = ['system', 'temperature', 'activity', 'ionic-strength', 'ion-size', 'component', 'reaction', 'solid', 'source', 'use', 'sweep', 'map', 'limit', 'sample', 'titrant', 'titrate']
const COMPONENT_SPECS = ['total', 'free', 'pH', 'pressure', 'balance', 'excess']
const ACTIVITY_MODELS = ['ideal', 'davies', 'debye-huckel']
const REACTION_TAIL = ['dH', 'cite', 'fit']
const SWEEP_VARIABLES = ['pH', 'total', 'temperature', 'pressure']
const SWEEP_WORDS = ['from', 'to', 'step', 'points', 'log']
const TITRATE_WORDS = ['to', 'step', 'points']

/** The part of a word already typed: formulas, keywords with `-`, units such as `mmol/L`, `°C`. */
const WORD_BEFORE_CURSOR = /[A-Za-z°µ][\w°µ/()^·:+-]*$/

export type CompletionKind = 'keyword' | 'unit' | 'constantKind' | 'symbol'

export interface CompletionPlan {
  kind: CompletionKind
  words: string[]
}

const AMOUNT: Dimension[] = ['concentration', 'mass-concentration']
/** What a number means after each word that can stand before it. */
const QUANTITY_AFTER: Record<string, Dimension[]> = {
  temperature: ['temperature'],
  'ionic-strength': ['concentration'],
  total: AMOUNT,
  free: AMOUNT,
  pressure: ['pressure'],
  dH: ['enthalpy'],
  'ion-size': ['length'],
}

/** The units of the given dimensions, as the language lists them. */
function unitsOf(dimensions: Dimension[]): CompletionPlan {
  return { kind: 'unit', words: UNITS.filter((unit) => dimensions.includes(unitInfo(unit)?.dimension as Dimension)) }
}

/** Only the words the language itself lists, so completion never offers a word the compiler rejects. */
function known(words: readonly string[], list: readonly string[]): string[] {
  return words.filter((word) => list.includes(word))
}

function symbolNames(symbols: readonly PoiseSymbol[], kinds?: PoiseSymbol['kind'][]): string[] {
  return symbols.filter((s) => !kinds || kinds.includes(s.kind)).map((s) => s.name)
}

/**
 * What may be typed after `before` (the tokens of the line left of the word
 * being typed). Null when nothing useful can be offered there.
 */
export function planCompletion(before: LineToken[], symbols: readonly PoiseSymbol[]): CompletionPlan | null {
  const last = before[before.length - 1]
  if (!last) return { kind: 'keyword', words: known(STATEMENT_WORDS, KEYWORDS) }
  if (last.role === 'comment') return null
  switch (before[0]!.image) {
    case 'reaction':
      return planReaction(before, symbols)
    case 'temperature':
    case 'ionic-strength':
      return last.role === 'number' ? unitsOf(QUANTITY_AFTER[before[0]!.image]!) : null
    case 'component': {
      if (before.length === 1) return { kind: 'symbol', words: symbolNames(symbols) }
      if (before.length === 2) return { kind: 'keyword', words: known(COMPONENT_SPECS, KEYWORDS) }
      // A pH is written without a unit; totals, free values and pressures take one.
      const quantity = QUANTITY_AFTER[before[2]!.image]
      return last.role === 'number' && quantity ? unitsOf(quantity) : null
    }
    case 'ion-size':
      // `ion-size F N Å`: a charged species, its size, then a length unit.
      if (before.length === 1) return { kind: 'symbol', words: symbols.filter((s) => s.ionSize !== null).map((s) => s.name) }
      return before.length === 3 && last.role === 'number' ? unitsOf(QUANTITY_AFTER['ion-size']!) : null
    case 'activity':
      return before.length === 1 ? { kind: 'keyword', words: known(ACTIVITY_MODELS, KEYWORDS) } : null
    case 'solid':
      if (before.length === 1) return { kind: 'symbol', words: symbolNames(symbols, ['solid']) }
      return before.length === 2 ? { kind: 'keyword', words: known(['suppressed'], KEYWORDS) } : null
    case 'sweep':
      return planAxis(before, symbols, SWEEP_WORDS)
    case 'map': {
      // `map AXIS by AXIS`: each axis as a sweep's; `by` once the first axis has its spacing.
      const by = before.findIndex((t) => t.image === 'by')
      if (by >= 0) return planAxis(before.slice(by), symbols, SWEEP_WORDS)
      const spaced = before.some((t) => t.image === 'step' || t.image === 'points') && last.role === 'number'
      const plan = planAxis(before, symbols, SWEEP_WORDS)
      if (spaced && before[before.length - 2]?.image === 'points') return { kind: 'keyword', words: known(['log', 'by'], KEYWORDS) }
      if (last.image === 'log') return { kind: 'keyword', words: known(['by'], KEYWORDS) }
      return spaced && plan?.kind === 'keyword' ? { kind: 'keyword', words: known([...plan.words, 'by'], KEYWORDS) } : plan
    }
    case 'limit': {
      // `limit dissolved X N UNIT`: X a component (not H+) or an element one of them holds (not H or O).
      if (before.length === 1) return { kind: 'keyword', words: known(['dissolved'], KEYWORDS) }
      if (before.length === 2) return { kind: 'symbol', words: limitTargets(symbols) }
      return before.length === 4 && last.role === 'number' ? unitsOf(AMOUNT) : null
    }
    case 'sample':
      // `sample volume N UNIT`
      if (before.length === 1) return { kind: 'keyword', words: known(['volume'], KEYWORDS) }
      return before.length === 3 && last.role === 'number' ? unitsOf(['volume']) : null
    case 'titrant':
      // `titrant F N UNIT`: a component or a species the reactions define, then a concentration.
      if (before.length === 1) return { kind: 'symbol', words: symbolNames(symbols, ['component', 'species']) }
      return before.length === 3 && last.role === 'number' ? unitsOf(AMOUNT) : null
    case 'titrate': {
      // `titrate from A to B (step D | points N)` or `titrate to pH X`.
      if (before.length === 1) return { kind: 'keyword', words: known(['from', 'to'], KEYWORDS) }
      if (before[1]!.image === 'to') return before.length === 2 ? { kind: 'keyword', words: known(['pH'], KEYWORDS) } : null
      const countsPoints = before[before.length - 2]?.image === 'points'
      if (last.role === 'number' && !countsPoints) return unitsOf(['volume'])
      return { kind: 'keyword', words: known(TITRATE_WORDS, KEYWORDS) }
    }
    default:
      return null
  }
}

/** Within `sweep …` or one axis of `map … by …` (`before` starts at the word before the variable). */
function planAxis(before: LineToken[], symbols: readonly PoiseSymbol[], words: string[]): CompletionPlan | null {
  const last = before[before.length - 1]!
  if (before.length === 1) return { kind: 'keyword', words: known(SWEEP_VARIABLES, KEYWORDS) }
  if (last.image === 'total' || last.image === 'pressure') return { kind: 'symbol', words: symbolNames(symbols, ['component']) }
  const quantity = QUANTITY_AFTER[before[1]!.image]
  const countsPoints = before[before.length - 2]?.image === 'points'
  if (last.role === 'number' && quantity && !countsPoints) return unitsOf(quantity)
  return { kind: 'keyword', words: known(words, KEYWORDS) }
}

/** What a `limit dissolved` may name: the elements the components hold (H and O aside), then the components (H+ aside). */
export function limitTargets(symbols: readonly PoiseSymbol[]): string[] {
  const components = symbols.filter((s) => s.kind === 'component' && s.name !== 'H+')
  const elements = [...new Set(components.flatMap((c) => Object.keys(c.elements)))].filter((e) => e !== 'H' && e !== 'O')
  return [...elements, ...components.map((c) => c.name)]
}

function planReaction(before: LineToken[], symbols: readonly PoiseSymbol[]): CompletionPlan | null {
  const last = before[before.length - 1]!
  const kindAt = before.findIndex((t) => t.role === 'constantKind')
  if (kindAt >= 0) {
    // Each clause once: `fit`, `dH` and `cite` already written are not offered again.
    const written = new Set(before.map((t) => t.image))
    const tail = known(REACTION_TAIL, KEYWORDS).filter((word) => !written.has(word))
    if (last.role === 'number') {
      const afterEnthalpy = before[before.length - 2]?.image === 'dH'
      if (afterEnthalpy) return unitsOf(QUANTITY_AFTER.dH!)
      // Right after the constant's value: its uncertainty may follow (`pKa 4.70 ± 0.05`).
      const afterValue = before.length - 2 === kindAt
      return { kind: 'keyword', words: afterValue ? [...UNCERTAINTY_SIGNS, ...tail] : tail }
    }
    // After a clause's end: a unit (dH), a citation (text or key), or `fit`.
    const clauseEnd = last.role === 'unit' || last.image === 'fit' || ((last.role === 'string' || last.role === 'word') && before[before.length - 2]?.image === 'cite')
    return clauseEnd ? { kind: 'keyword', words: tail } : null
  }
  // Before the constant: species are joined by `+`, a number is a coefficient.
  const hasArrow = before.some((t) => t.role === 'arrow')
  if (last.role === 'formula' && hasArrow) return { kind: 'constantKind', words: [...CONSTANT_KINDS] }
  if (before.length === 1 || last.role === 'plus' || last.role === 'arrow' || last.role === 'number') {
    return { kind: 'symbol', words: symbolNames(symbols) }
  }
  return null
}

const COMPLETION_TYPE: Record<CompletionKind, string> = {
  keyword: 'keyword',
  unit: 'unit',
  constantKind: 'constant',
  symbol: 'variable',
}

function toOptions(plan: CompletionPlan, symbols: readonly PoiseSymbol[]): Completion[] {
  return [...new Set(plan.words)].map((word) => ({
    label: word,
    type: COMPLETION_TYPE[plan.kind],
    detail: plan.kind === 'symbol' ? (symbols.find((s) => s.name === word)?.kind ?? 'element') : plan.kind === 'constantKind' ? 'constant' : undefined,
  }))
}

/** The completions at `pos`, or null; split out of the source so it can be checked on a bare state. */
export function completionsAt(state: EditorState, pos: number, explicit: boolean): CompletionResult | null {
  const line = state.doc.lineAt(pos)
  const textBefore = line.text.slice(0, pos - line.from)
  const typed = WORD_BEFORE_CURSOR.exec(textBefore)
  const wordFrom = typed ? textBefore.length - typed[0].length : textBefore.length
  if (!typed && !explicit && !/\s$/.test(textBefore)) return null
  const before = lexLine(textBefore.slice(0, wordFrom))
  const symbols = state.field(poiseSymbolsField, false) ?? []
  const plan = planCompletion(before, symbols)
  if (!plan || plan.words.length === 0) return null
  return {
    from: line.from + wordFrom,
    options: toOptions(plan, symbols),
    validFor: /^[\w°µ/()^·:+-]*$/,
  }
}

export function poiseCompletionSource(context: CompletionContext): CompletionResult | null {
  return completionsAt(context.state, context.pos, context.explicit)
}
