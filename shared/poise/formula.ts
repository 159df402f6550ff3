/**
 * Chemical formulas: composition and charge from the text of a formula, and
 * the caret form results and diagnostics use. A formula is never declared
 * twice: what it is made of comes from how it is written.
 */
import type { Phase } from './model'
import { isElement, molarMassOf } from './elements'
import { MAX_ATOM_COUNT, MAX_CHARGE } from './limits'

export interface ParsedFormula {
  /** Caret form: `Cu(NH3)4^2+`, `SO4^2-`, `NH4+`, `CaSO4·2H2O(s)`. */
  name: string
  elements: Record<string, number>
  charge: number
  phase: Phase
  /** g/mol, or null when an element has no standard atomic weight. */
  molarMass: number | null
  /** The abbreviations of the file this formula uses (`Cit` in `NiCit-`), in order of appearance; absent when none. */
  abbreviations?: string[]
}

/** A group of atoms a file names once (`abbreviation Cit = C6H5O7`) and uses in formulas. */
export interface Abbreviation {
  name: string
  /** The formula it stands for, as written (`C6H5O7`). */
  formula: string
  elements: Record<string, number>
  /** Offset of its name in the file: a use above it is reported. */
  from: number
}

/** The abbreviations of one file, by name. */
export type Abbreviations = ReadonlyMap<string, Abbreviation>

/** What an abbreviation's name may be: a capital letter, then letters only (digits would read as a count). */
export const ABBREVIATION_NAME = /^[A-Z][A-Za-z]{0,11}$/

export interface FormulaProblem {
  code: 'P010' | 'P011' | 'P012'
  message: string
  /** Offsets inside the formula text, `to` exclusive. */
  from: number
  to: number
  /** Replacement texts for the whole formula, offered as fixes. */
  fixes?: string[]
}

export type FormulaResult = { formula: ParsedFormula; problem: null } | { formula: null; problem: FormulaProblem }

const SUPERSCRIPT_DIGITS = '⁰¹²³⁴⁵⁶⁷⁸⁹'
const SUBSCRIPT_DIGITS = '₀₁₂₃₄₅₆₇₈₉'
/** Deeper nesting is no real formula; the limit keeps recursion bounded. */
const MAX_BRACKET_DEPTH = 8
const PHASES: Record<string, Phase> = { '(s)': 's', '(g)': 'g', '(aq)': 'aq' }

/** The charge suffix in caret form: `^2+`, `-`, or `^+` after a lone element with a count (`I3^-`). */
export function formatCharge(core: string, charge: number): string {
  if (charge === 0) return ''
  const sign = charge > 0 ? '+' : '-'
  const n = Math.abs(charge)
  if (n > 1) return `^${n}${sign}`
  return /^[A-Z][a-z]?\d+$/.test(core) ? `^${sign}` : sign
}

/** Caret-form name from the parts of a formula. */
export function formatSpecies(core: string, charge: number, phase: Phase): string {
  return core + formatCharge(core, charge) + (phase === 'aq' ? '' : `(${phase})`)
}

function problem(code: FormulaProblem['code'], message: string, from: number, to: number, fixes?: string[]): FormulaResult {
  return { formula: null, problem: fixes ? { code, message, from, to, fixes } : { code, message, from, to } }
}

interface CoreParse { elements: Record<string, number>; canonical: string; error: FormulaProblem | null; used: string[] }

/** The abbreviation that starts at `i`, the longest first; it must not run on into a lower-case letter (`Cit` is not in `Citr`). */
function abbreviationAt(text: string, i: number, names: readonly string[]): string | null {
  for (const name of names) {
    if (text.startsWith(name, i) && !/[a-z]/.test(text[i + name.length] ?? '')) return name
  }
  return null
}

/** The message for a capitalised word that is no element symbol: it may be an abbreviation the file has not defined. */
function unknownSymbolMessage(text: string, start: number, symbol: string, abbreviations: Abbreviations | undefined): string {
  const run = /^[A-Z][A-Za-z]*/.exec(text.slice(start))![0]
  let around = start
  while (around > 0 && /[A-Za-z]/.test(text[around - 1]!)) around--
  const whole = /^[A-Za-z]*/.exec(text.slice(around))![0]
  const elementHint = `'${symbol}' is not an element symbol (element symbols are one capital letter and at most one small one: Cu, Cl, N)`
  // A defined abbreviation in other letter case (CIT for Cit), standing alone or at the end of the letters.
  const near = [...(abbreviations?.keys() ?? [])].find((name) => [run, whole].some((w) => w.toLowerCase() === name.toLowerCase()))
  if (near) return `'${whole.toLowerCase() === near.toLowerCase() ? whole : run}' is neither an element symbol nor an abbreviation of this file: did you mean ${near}? (letter case counts)`
  if (run.length < 2 || !ABBREVIATION_NAME.test(run)) return elementHint
  return `'${run}' is neither an element symbol nor an abbreviation of this file: to name a group of atoms, add \`abbreviation ${run} = FORMULA\` above its first use (element symbols are one capital letter and at most one small one: Cu, Cl, N)`
}

/** Parses the body of a formula (no charge, no phase): element symbols, abbreviations, counts, brackets, hydrate dots. */
function parseCore(text: string, base: number, abbreviations?: Abbreviations): CoreParse {
  const elements: Record<string, number> = {}
  const names = abbreviations ? [...abbreviations.keys()].sort((a, b) => b.length - a.length) : []
  const used: string[] = []
  let i = 0
  let canonical = ''
  const fail = (message: string, code: FormulaProblem['code'], from: number, to: number): CoreParse =>
    ({ elements, canonical, used, error: { code, message, from: base + from, to: base + to } })

  const readCount = (): number | null => {
    let digits = ''
    while (i < text.length) {
      const ch = text[i]!
      const sub = SUBSCRIPT_DIGITS.indexOf(ch)
      if (ch >= '0' && ch <= '9') digits += ch
      else if (sub >= 0) digits += String(sub)
      else break
      i++
    }
    return digits === '' ? null : Number(digits)
  }

  // Returns element counts of a group, or an error. Stops at a closing bracket or a hydrate dot.
  const group = (closer: string | null, depth = 0): Record<string, number> | CoreParse => {
    const counts: Record<string, number> = {}
    let parts = 0
    while (i < text.length) {
      const ch = text[i]!
      if (ch === ')' || ch === ']' || ch === '·' || ch === ':') break
      const start = i
      let inner: Record<string, number>
      if (ch === '(' || ch === '[') {
        const close = ch === '(' ? ')' : ']'
        if (depth >= MAX_BRACKET_DEPTH) return fail(`brackets nested more than ${MAX_BRACKET_DEPTH} deep`, 'P010', start, start + 1)
        canonical += ch
        i++
        const sub = group(close, depth + 1)
        if ('error' in sub) return sub
        if (text[i] !== close) return fail(`'${ch}' is never closed: add '${close}'`, 'P010', start, i)
        canonical += close
        i++
        inner = sub as Record<string, number>
        if (Object.keys(inner).length === 0) return fail('empty brackets in a formula', 'P010', start, i)
      } else if (ch >= 'A' && ch <= 'Z' && abbreviationAt(text, i, names) !== null) {
        const name = abbreviationAt(text, i, names)!
        i += name.length
        canonical += name
        if (!used.includes(name)) used.push(name)
        inner = abbreviations!.get(name)!.elements
      } else if (ch >= 'A' && ch <= 'Z') {
        i++
        while (i < text.length && text[i]! >= 'a' && text[i]! <= 'z') i++
        const symbol = text.slice(start, i)
        if (!isElement(symbol)) {
          return fail(unknownSymbolMessage(text, start, symbol, abbreviations), 'P011', start, i)
        }
        canonical += symbol
        inner = { [symbol]: 1 }
      } else {
        return fail(`unexpected '${ch}' in a formula: expected an element symbol, a count or brackets`, 'P010', i, i + 1)
      }
      const countAt = i
      const count = readCount()
      if (count === 0) return fail('an atom count of 0 is not allowed', 'P010', countAt, i)
      if (count !== null) canonical += String(count)
      for (const [el, n] of Object.entries(inner)) counts[el] = (counts[el] ?? 0) + n * (count ?? 1)
      parts++
    }
    if (closer === null && parts === 0) return fail('expected an element symbol', 'P010', i, Math.min(text.length, i + 1))
    return counts
  }

  const first = group(null)
  if ('error' in first) return first as CoreParse
  for (const [el, n] of Object.entries(first as Record<string, number>)) elements[el] = n
  while (i < text.length) {
    const ch = text[i]!
    if (ch !== '·' && ch !== ':') return fail(`unexpected '${ch}' in a formula`, 'P010', i, i + 1)
    canonical += '·'
    i++
    const multiplier = readCount()
    if (multiplier === 0) return fail('a hydrate count of 0 is not allowed', 'P010', i - 1, i)
    if (multiplier !== null) canonical += String(multiplier)
    const part = group(null)
    if ('error' in part) return part as CoreParse
    for (const [el, n] of Object.entries(part as Record<string, number>)) elements[el] = (elements[el] ?? 0) + n * (multiplier ?? 1)
  }
  return { elements, canonical, used, error: null }
}

interface ChargeSplit { body: string; charge: number; problem: FormulaProblem | null }

/** Splits the charge off the end of a formula body, recognising the wrong notations to explain them. */
function splitCharge(body: string, phaseSuffix: string): ChargeSplit {
  const sup = /([⁰¹²³⁴⁵⁶⁷⁸⁹]*)([⁺⁻])$/.exec(body)
  if (sup) {
    const digits = [...sup[1]!].map((c) => SUPERSCRIPT_DIGITS.indexOf(c)).join('')
    const n = digits === '' ? 1 : Number(digits)
    return { body: body.slice(0, sup.index), charge: sup[2] === '⁺' ? n : -n, problem: null }
  }
  const caret = body.lastIndexOf('^')
  if (caret >= 0) {
    const after = body.slice(caret + 1)
    const core = body.slice(0, caret)
    const good = /^(\d*)([+-])$/.exec(after)
    if (good) {
      const n = good[1] === '' ? 1 : Number(good[1])
      if (n === 0) return { body, charge: 0, problem: { code: 'P012', message: 'a charge of 0 is written by leaving the charge out', from: caret, to: body.length, fixes: [core + phaseSuffix] } }
      return { body: core, charge: good[2] === '+' ? n : -n, problem: null }
    }
    const bad = /^([+-]+)(\d*)$/.exec(after) ?? /^(\d+)$/.exec(after)
    let fix: string | null = null
    if (bad && /^[+-]+$/.test(bad[1]!) && new Set(bad[1]).size === 1) {
      const n = bad[2] ? Number(bad[2]) : bad[1]!.length
      fix = core + formatCharge(core, bad[1]![0] === '+' ? n : -n) + phaseSuffix
    }
    const fixes = fix ? [fix] : /^\d+$/.test(after) && Number(after) > 0
      ? [core + formatCharge(core, Number(after)) + phaseSuffix, core + formatCharge(core, -Number(after)) + phaseSuffix]
      : []
    const message = fix
      ? `write the charge after the caret as number then sign: ${fix}`
      : fixes.length ? `a charge needs a sign: ${fixes[0]} or ${fixes[1]}` : `after '^' write the charge as a number and a sign, as in Cu^2+ or SO4^2-`
    return { body, charge: 0, problem: { code: 'P012', message, from: caret, to: body.length, ...(fixes.length ? { fixes } : {}) } }
  }
  const signs = /([+-]+)(\d*)$/.exec(body)
  if (!signs) return { body, charge: 0, problem: null }
  const core = body.slice(0, signs.index)
  const signText = signs[1]!
  if (new Set(signText).size > 1) {
    return { body, charge: 0, problem: { code: 'P012', message: `'${signText}' mixes + and -: write one charge in caret form, as in Cu^2+ or SO4^2-`, from: signs.index, to: body.length } }
  }
  const positive = signText[0] === '+'
  if (signs[2] !== '' || signText.length > 1) {
    const n = signs[2] !== '' ? Number(signs[2]) * signText.length : signText.length
    const fix = core + formatCharge(core, positive ? n : -n) + phaseSuffix
    return { body, charge: 0, problem: { code: 'P012', message: `write this charge in caret form: ${fix}`, from: signs.index, to: body.length, fixes: [fix] } }
  }
  // A lone sign is a single charge (NH4+, HCO3-), except after one element with a count,
  // where chemists usually meant the count as the charge (Ca2+ for Ca^2+).
  const lone = /^([A-Z][a-z]?)(\d+)$/.exec(core)
  if (lone) {
    const asCharge = lone[1]! + formatCharge(lone[1]!, (positive ? 1 : -1) * Number(lone[2])) + phaseSuffix
    const asCount = core + formatCharge(core, positive ? 1 : -1) + phaseSuffix
    return {
      body, charge: 0,
      problem: { code: 'P012', message: `ambiguous charge: write ${asCharge} for a charge of ${lone[2]}${signText}, or ${asCount} for ${lone[2]} atoms with a single charge`, from: lone[1]!.length, to: body.length, fixes: [asCharge, asCount] },
    }
  }
  return { body: core, charge: positive ? 1 : -1, problem: null }
}

// The editor recompiles on every keystroke and a file repeats its formulas:
// results are memoised (they are treated as read-only by every caller), per
// table of abbreviations (a compile makes one table and reads it throughout).
const cache = new Map<string, FormulaResult>()
const abbreviatedCaches = new WeakMap<Abbreviations, Map<string, FormulaResult>>()
const CACHE_LIMIT = 20000

/**
 * Parses a formula such as `Cu(NH3)4^2+`, `CaSO4·2H2O(s)` or `SO₄²⁻`, and
 * with a file's abbreviations `NiCit-` or `Ni(Cit)2^4-` (the name keeps the
 * abbreviation as written; the composition counts its atoms). Never throws.
 * Treat the result as read-only.
 */
export function parseFormula(text: string, abbreviations?: Abbreviations): FormulaResult {
  let memo = cache
  if (abbreviations && abbreviations.size > 0) {
    memo = abbreviatedCaches.get(abbreviations) ?? new Map()
    abbreviatedCaches.set(abbreviations, memo)
  }
  let r = memo.get(text)
  if (r === undefined) {
    if (memo.size >= CACHE_LIMIT) memo.clear()
    r = parseFormulaUncached(text, abbreviations)
    memo.set(text, r)
  }
  return r
}

function parseFormulaUncached(text: string, abbreviations?: Abbreviations): FormulaResult {
  let body = text
  let phase: Phase = 'aq'
  let phaseSuffix = ''
  for (const [suffix, p] of Object.entries(PHASES)) {
    if (body.endsWith(suffix) && body.length > suffix.length) {
      body = body.slice(0, -suffix.length)
      phase = p
      phaseSuffix = p === 'aq' ? '' : suffix
      break
    }
  }
  const split = splitCharge(body, phaseSuffix)
  if (split.problem) return { formula: null, problem: split.problem }
  const core = parseCore(split.body, 0, abbreviations)
  if (core.error) return { formula: null, problem: core.error }
  const tooMany = Object.entries(core.elements).find(([, n]) => !(n <= MAX_ATOM_COUNT))
  if (tooMany) return problem('P010', `${tooMany[0]} is counted more than ${MAX_ATOM_COUNT} times: a formula holds 1 to ${MAX_ATOM_COUNT} atoms of each element`, 0, text.length)
  if (!(Math.abs(split.charge) <= MAX_CHARGE)) return problem('P010', `a charge must be from −${MAX_CHARGE} to +${MAX_CHARGE}`, 0, text.length)
  if (phase !== 'aq' && split.charge !== 0) {
    return problem('P010', `a ${phase === 's' ? 'solid' : 'gas'} carries no charge: remove the charge or the phase`, 0, text.length)
  }
  return {
    formula: {
      name: formatSpecies(core.canonical, split.charge, phase),
      elements: core.elements,
      charge: split.charge,
      phase,
      molarMass: molarMassOf(core.elements),
      ...(core.used.length ? { abbreviations: core.used } : {}),
    },
    problem: null,
  }
}

/** True for the solvent, whatever way it is written (H2O, H₂O, H2O(aq)). */
export function isWater(f: ParsedFormula): boolean {
  return f.name === 'H2O'
}
