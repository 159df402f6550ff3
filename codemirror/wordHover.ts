/**
 * Hover on the words around the formulas: a keyword (what it does, from the
 * language reference itself, grammar/README.md) and a number with its unit
 * (the value in the unit the model uses, through the molar mass of the
 * line's formula for a mass concentration); a constant's kind gets its
 * meaning from the same text (hover.ts shows the constant). The reference is the one text of
 * what the words mean; nothing here restates it.
 */
import type { EditorState } from '@codemirror/state'
import readme from '../grammar/README.md?raw'
import type { PoiseSymbol } from '../shared/poise/index'
import { parseFormula } from '../shared/poise/formula'
import { formatNumber } from '../shared/poise/limits'
import { convert, parseNumber, unitInfo, type Dimension } from '../shared/poise/units'
import { referenceLink } from '../utils/referenceLink'
import { abbreviationsOf, poiseSymbolsField } from './analysis'
import { lexLine, type LineToken } from './language'

export interface WordDescription {
  /** What is hovered, as written (`pKa 9.24`, `120 mg/L`, `balance`). */
  title: string
  /** Lines of explanation, plain text. */
  lines: string[]
  /** The reference at the statement of the line. */
  link: string
}

/** Markdown of the reference made plain: code spans, emphasis and links as their text. */
function plain(markdown: string): string {
  return markdown.replace(/`([^`]*)`/g, '$1').replace(/\*\*([^*]+)\*\*/g, '$1').replace(/\[([^\]]+)\]\([^)]*\)/g, '$1').replace(/\s+/g, ' ').trim()
}

interface Section { keywords: string[]; syntax: string; first: string; rows: [string, string][] }

/** The statements of the reference: their heading (the syntax), the first paragraph, and the rows of their tables. */
function readSections(text: string): Section[] {
  const sections: Section[] = []
  for (const block of text.split(/\n(?=### )/).slice(1)) {
    const [heading, ...rest] = block.split('\n')
    const syntax = heading!.replace(/^### /, '')
    const keywords = [...syntax.matchAll(/`([^`]+)`/g)].map((m) => m[1]!.trim().split(/\s+/)[0]!)
    const body = rest.join('\n').split(/\n## /)[0]!
    const first = body.split(/\n\s*\n/).map((p) => p.trim()).find((p) => p && !p.startsWith('|') && !p.startsWith('```') && !p.startsWith('<!--')) ?? ''
    const rows = body.split('\n').filter((l) => /^\|\s*`/.test(l)).map((l) => {
      const cells = l.split('|').slice(1, -1).map((c) => c.trim())
      return [cells[0] ?? '', cells[1] ?? ''] as [string, string]
    })
    sections.push({ keywords, syntax: plain(syntax), first: plain(first), rows })
  }
  return sections
}

let sections: Section[] | null = null
function reference(): Section[] {
  return (sections ??= readSections(readme))
}

/** The row of a table of the statement whose first cell begins with `word` (`total N UNIT`, `pKa`, `logbeta`…): its first cell and its meaning. */
function tableRow(section: Section | undefined, word: string): { syntax: string; meaning: string } | null {
  const row = section?.rows.find(([first]) => [...first.matchAll(/`([^`]+)`/g)].some((m) => m[1]!.split(/\s+/)[0] === word))
  return row ? { syntax: plain(row[0]), meaning: plain(row[1]) } : null
}

function rowFor(section: Section | undefined, word: string): string | null {
  return tableRow(section, word)?.meaning ?? null
}

function sectionOf(keyword: string): Section | undefined {
  return reference().find((s) => s.keywords.includes(keyword))
}

/** A keyword: the statement it opens (syntax and first sentence), or its row in the statement's table, or the statement it belongs to. */
export function describeKeyword(word: string, statement: string): WordDescription {
  const own = sectionOf(word)
  const section = own ?? sectionOf(statement)
  const row = own ? null : tableRow(section, word)
  const lines = own ? [own.syntax, own.first] : row ? [row.meaning] : section ? [`part of ${section.syntax}`, section.first] : []
  return { title: row?.syntax ?? word, lines: lines.filter(Boolean), link: referenceLink(own ? word : statement) }
}

/** What the number after a constant kind is, from the reference's table of kinds (`pKa` → "acid dissociation constant"). */
export function constantKindMeaning(kind: string): string | null {
  return rowFor(sectionOf('reaction'), kind)
}

const MODEL_UNIT: Record<Dimension, string> = {
  concentration: 'mol/L', 'mass-concentration': 'mol/L', pressure: 'atm', temperature: '°C', enthalpy: 'kJ/mol', length: 'Å', volume: 'L',
}

/** A number with its unit in the model's unit; a mass concentration through the molar mass of the line's formula. */
export function describeQuantity(numberText: string, unit: string, lineTokens: LineToken[], symbols: readonly PoiseSymbol[]): WordDescription | null {
  const info = unitInfo(unit)
  if (!info) return null
  const value = parseNumber(numberText)
  const title = `${numberText} ${unit}`
  const statement = lineTokens[0]?.image ?? ''
  const link = referenceLink(statement)
  if (info.dimension === 'mass-concentration') {
    const formulaTok = lineTokens.find((t) => t.role === 'formula')
    const formula = formulaTok ? parseFormula(formulaTok.image, abbreviationsOf(symbols)).formula : null
    // An element symbol (`limit dissolved Ni`) weighs as the element; a formula, as the whole formula.
    const grams = formula?.molarMass ?? null
    if (!formula || !grams) return { title, lines: [`a mass concentration: ${formatNumber(value * info.factor)} g/L, divided by the molar mass of the formula of the line`], link }
    const molar = (value * info.factor) / grams
    return { title, lines: [`= ${formatNumber(Number(molar.toPrecision(6)))} mol/L of ${formula.name} (${grams.toFixed(3)} g/mol, IUPAC standard atomic weights)`], link }
  }
  const converted = convert(value, unit, info.dimension)
  if (converted === null) return null
  const lines = [`= ${formatNumber(Number(converted.toPrecision(6)))} ${MODEL_UNIT[info.dimension]}`]
  if (info.dimension === 'temperature') lines.push(`= ${formatNumber(Number((converted + 273.15).toPrecision(6)))} K`)
  return { title, lines, link }
}

/** The description of the word under `pos` that is not a formula: keyword, constant, number with its unit. */
export function wordAt(state: EditorState, pos: number): { from: number; to: number; description: WordDescription } | null {
  const line = state.doc.lineAt(pos)
  const offset = pos - line.from
  const tokens = lexLine(line.text)
  const i = tokens.findIndex((t) => t.from <= offset && offset <= t.to && t.role !== 'formula')
  const token = tokens[i]
  if (!token) return null
  const range = (from: LineToken, to: LineToken = from) => ({ from: line.from + from.from, to: line.from + to.to })
  const statement = tokens[0]?.image ?? ''
  const symbols = state.field(poiseSymbolsField, false) ?? []
  if (token.role === 'statement' || token.role === 'keyword') return { ...range(token), description: describeKeyword(token.image, statement) }
  // A constant kind, its value, ± and fit are hover.ts's (constantAt).
  const number = token.role === 'unit' ? tokens[i - 1] : token.role === 'number' ? token : undefined
  const unit = token.role === 'unit' ? token : token.role === 'number' ? tokens[i + 1] : undefined
  if (number?.role === 'number' && unit?.role === 'unit') {
    const description = describeQuantity(number.image, unit.image, tokens, symbols)
    if (description) return { ...range(number, unit), description }
  }
  return null
}

export function renderWord(description: WordDescription): HTMLElement {
  const dom = document.createElement('div')
  dom.className = 'cm-poise-hover'
  const title = dom.appendChild(document.createElement('div'))
  title.className = 'cm-poise-hover-title'
  title.textContent = description.title
  for (const text of description.lines) dom.appendChild(document.createElement('p')).textContent = text
  const link = dom.appendChild(document.createElement('a'))
  link.href = description.link
  link.target = '_blank'
  link.rel = 'noopener'
  link.textContent = 'Reference (F1)'
  return dom
}
