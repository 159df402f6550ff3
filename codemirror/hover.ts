/**
 * Hover on a formula: what the compiler made of that species — composition
 * and charge read from the formula, molar mass, and the log10 formation
 * constant from the components after the reactions were chained.
 */
import { hoverTooltip, type Tooltip } from '@codemirror/view'
import type { EditorState } from '@codemirror/state'
import type { PoiseSymbol } from '../shared/poise/index'
import { isWater, parseFormula, type ParsedFormula } from '../shared/poise/formula'
import { abbreviationsOf, poiseSymbolsField } from './analysis'
import { lexLine, type LineToken } from './language'
import type { ConstantKind } from '../shared/poise/model'
import { logKFromConstant, logKUncertaintyFromConstant } from '../shared/poise/reactions'
import { formatNumber } from '../shared/poise/limits'
import { parseNumber } from '../shared/poise/units'
import { typesetFormula } from '../shared/results/typeset'
import { withoutCharge } from '../shared/poise/limitStatement'
import { constantKindMeaning, renderWord, wordAt } from './wordHover'

export interface SymbolDescription {
  /** Typeset name, e.g. `Cu(NH₃)₄²⁺`. */
  title: string
  /** What the compiler made of it; `solvent` for water, `formula` when the compile did not reach it, `limit` for the target of `limit dissolved`. */
  kind: PoiseSymbol['kind'] | 'solvent' | 'formula' | 'limit'
  /** Element counts in the order the formula gives them. */
  composition: { element: string; count: number }[]
  /** Signed charge as chemists write it: `+2`, `0`, `−1`. */
  charge: string
  molarMass: string
  /** `log₁₀ β = 13.10`, or the reason there is no constant. */
  formation: string
  /** Charged dissolved species: the ion size of the extended Debye–Hückel model and where it comes from; else null. */
  ionSize: string | null
  /** The file's abbreviations the formula is written with (`Cit = C6H5O7`); absent when none. */
  writtenWith?: string
}

export function formatCharge(charge: number): string {
  if (charge > 0) return `+${charge}`
  if (charge < 0) return `−${-charge}`
  return '0'
}

function formatMolarMass(molarMass: number | null): string {
  return molarMass === null ? 'no standard atomic weight for one of its elements' : `${molarMass.toFixed(3)} g/mol`
}

export function describeSymbol(symbol: PoiseSymbol): SymbolDescription {
  return {
    title: typesetFormula(symbol.name),
    kind: symbol.kind,
    composition: Object.entries(symbol.elements).map(([element, count]) => ({ element, count })),
    charge: formatCharge(symbol.charge),
    molarMass: formatMolarMass(symbol.molarMass),
    formation: describeFormation(symbol),
    ionSize: describeIonSize(symbol.ionSize),
  }
}

const ION_SIZE_FROM: Record<NonNullable<PoiseSymbol['ionSize']>['source'], string> = {
  file: 'given by ion-size in this file',
  table: 'built-in table',
  charge: 'guessed from the charge: give it with ion-size',
}

function describeIonSize(size: PoiseSymbol['ionSize']): string | null {
  return size ? `${size.angstrom} Å (${ION_SIZE_FROM[size.source]}; used by activity debye-huckel)` : null
}

/**
 * A formula the last compile did not define (water, or a species behind an
 * error): what its text alone says, so hover still helps while the file is
 * broken.
 */
export function describeFormula(formula: ParsedFormula): SymbolDescription {
  const water = isWater(formula)
  return {
    title: typesetFormula(formula.name),
    kind: water ? 'solvent' : 'formula',
    composition: Object.entries(formula.elements).map(([element, count]) => ({ element, count })),
    charge: formatCharge(formula.charge),
    molarMass: formatMolarMass(formula.molarMass),
    formation: water ? 'the solvent: activity 1, never a component' : 'not resolved: no component or reaction defines it yet, or an error stands in the way',
    ionSize: null,
  }
}

function describeFormation(symbol: PoiseSymbol): string {
  if (symbol.kind === 'abbreviation') return `stands for ${symbol.stands ?? '?'} wherever the file writes ${symbol.name} in a formula (charge written on each species)`
  if (symbol.kind === 'component') return 'a component (its own basis, log₁₀ β = 0)'
  if (symbol.logK === null) return 'formation constant not resolved (see the diagnostics)'
  const label = symbol.kind === 'species' ? 'log₁₀ β' : 'log₁₀ K'
  return `${label} = ${symbol.logK.toFixed(2)} (formation from the components)`
}

/** The symbol a formula written in the document stands for, whichever way it is written (`Ca²⁺`, `Ca^2+`, `NiCit^-`). */
export function findSymbol(symbols: readonly PoiseSymbol[], written: string): PoiseSymbol | undefined {
  const name = parseFormula(written, abbreviationsOf(symbols)).formula?.name ?? written
  return symbols.find((symbol) => symbol.name === name)
}

/**
 * The target of `limit dissolved X`: which dissolved total it caps and in
 * which mass a mass unit counts it. Null when X is no element a component
 * holds and no component (the checker says why).
 */
export function describeLimitTarget(symbols: readonly PoiseSymbol[], written: string): SymbolDescription | null {
  const components = symbols.filter((s) => s.kind === 'component')
  const parsed = parseFormula(written).formula
  if (!parsed) return null
  const component = findSymbol(components, written)
  const element = !component && Object.keys(parsed.elements).length === 1 && parsed.charge === 0 && parsed.elements[written] === 1 ? written : null
  const holders = element ? components.filter((c) => (c.elements[element] ?? 0) > 0) : []
  if (!component && holders.length === 0) return null
  return {
    title: `dissolved ${typesetFormula(element ?? withoutCharge(component!.name))}`,
    kind: 'limit',
    composition: Object.entries(parsed.elements).map(([e, count]) => ({ element: e, count })),
    charge: formatCharge(parsed.charge),
    molarMass: element ? `${formatMolarMass(parsed.molarMass)} (a mass unit counts the element)` : `${formatMolarMass(component!.molarMass)} (a mass unit counts the whole ${typesetFormula(component!.name)})`,
    formation: element
      ? `the ${element} atoms of ${holders.map((c) => typesetFormula(c.name)).join(', ')} in every dissolved species; a solid's share is not counted`
      : `Σ ν·c of ${typesetFormula(component!.name)} over the dissolved species; a solid's share is not counted`,
    ionSize: null,
  }
}

/** The description of the species under document position `pos`, with the formula's range. */
export function symbolAt(state: EditorState, pos: number): { from: number; to: number; description: SymbolDescription } | null {
  const line = state.doc.lineAt(pos)
  const offset = pos - line.from
  const tokens = lexLine(line.text)
  const token = tokens.find((t) => t.role === 'formula' && t.from <= offset && offset <= t.to)
  if (!token) return null
  const symbols = state.field(poiseSymbolsField, false) ?? []
  if (tokens[0]?.image === 'limit' && tokens[2] === token) {
    const target = describeLimitTarget(symbols, token.image)
    if (target) return { from: line.from + token.from, to: line.from + token.to, description: target }
  }
  const symbol = findSymbol(symbols, token.image)
  const formula = symbol ? null : parseFormula(token.image, abbreviationsOf(symbols)).formula
  const description = symbol ? describeSymbol(symbol) : formula ? describeFormula(formula) : null
  if (!description) return null
  const table = abbreviationsOf(symbols)
  const used = symbol?.kind === 'abbreviation' ? [] : (parseFormula(token.image, table).formula?.abbreviations ?? [])
  if (used.length) description.writtenWith = used.map((name) => `${name} = ${table.get(name)!.formula}`).join(', ')
  return { from: line.from + token.from, to: line.from + token.to, description }
}

/** What hover says about a reaction's constant: its kind, value, log K, the ± and whether it is fitted. */
export interface ConstantDescription {
  title: string
  rows: [string, string][]
}

/**
 * The constant of a reaction line, read from the line's own tokens (so hover
 * works while the file has errors elsewhere), when `offset` is on its kind,
 * value, ±, uncertainty or `fit`. Null elsewhere.
 */
export function constantAt(tokens: readonly LineToken[], offset: number): { from: number; to: number; description: ConstantDescription } | null {
  if (tokens[0]?.image !== 'reaction') return null
  const k = tokens.findIndex((t) => t.role === 'constantKind')
  const valueTok = tokens[k + 1]
  if (k < 0 || valueTok?.role !== 'number') return null
  const sign = tokens[k + 2]?.role === 'plusMinus' ? tokens[k + 2]! : null
  const sigmaTok = sign && tokens[k + 3]?.role === 'number' ? tokens[k + 3]! : null
  const fitTok = tokens.slice(k + 2).find((t) => t.name === 'FitKeyword') ?? null
  const parts = [tokens[k]!, valueTok, sign, sigmaTok, fitTok].filter((t): t is LineToken => t !== null)
  const under = parts.find((t) => t.from <= offset && offset <= t.to)
  if (!under) return null
  const kind = tokens[k]!.image as ConstantKind
  const value = parseNumber(valueTok.image)
  const logK = logKFromConstant(kind, value)
  const meaning = constantKindMeaning(kind)
  const rows: [string, string][] = [['value', `${kind} ${valueTok.image}`], ...(meaning ? [['kind', meaning] as [string, string]] : [])]
  if (logK !== null && kind !== 'logK') rows.push(['log₁₀ K', `${formatNumber(logK)} (of the reaction as written)`])
  if (sigmaTok) {
    const sigma = parseNumber(sigmaTok.image)
    const inLog = logK !== null && sigma > 0 ? logKUncertaintyFromConstant(kind, value, sigma) : null
    const same = inLog !== null && Math.abs(inLog - sigma) < 1e-12
    rows.push(['uncertainty', `± ${sigmaTok.image}${inLog !== null && !same ? ` (± ${formatNumber(inLog)} in log₁₀ K)` : ''}; answers carry a ± from it`])
  } else rows.push(['uncertainty', 'none given: write ± after the value (e.g. ± 0.05) to carry it into the answers'])
  rows.push(['fit', fitTok ? 'to be fitted to a data set (the value is the starting guess)' : 'no: the value is used as written'])
  const first = parts[0]!
  const last = parts[parts.length - 1]!
  return { from: first.from, to: Math.max(last.to, under.to), description: { title: `constant · ${kind}`, rows } }
}

function renderConstant(description: ConstantDescription): HTMLElement {
  const dom = document.createElement('div')
  dom.className = 'cm-poise-hover'
  const title = dom.appendChild(document.createElement('div'))
  title.className = 'cm-poise-hover-title'
  title.textContent = description.title
  const table = dom.appendChild(document.createElement('dl'))
  for (const [label, value] of description.rows) {
    table.appendChild(document.createElement('dt')).textContent = label
    table.appendChild(document.createElement('dd')).textContent = value
  }
  return dom
}

const KIND_LABEL: Record<SymbolDescription['kind'], string> = {
  component: 'component',
  species: 'species',
  solid: 'solid',
  gas: 'gas',
  solvent: 'solvent',
  formula: 'not defined yet',
  limit: 'what the limit caps',
  abbreviation: 'abbreviation',
}

function renderDescription(description: SymbolDescription): HTMLElement {
  const dom = document.createElement('div')
  dom.className = 'cm-poise-hover'
  const title = dom.appendChild(document.createElement('div'))
  title.className = 'cm-poise-hover-title'
  title.textContent = `${description.title} · ${KIND_LABEL[description.kind]}`
  const rows: [string, string][] = [
    ['composition', description.composition.map((c) => `${c.element} ${c.count}`).join(', ')],
    ['charge', description.charge],
    ['molar mass', description.molarMass],
    ['formation', description.formation],
    ...(description.ionSize ? [['ion size', description.ionSize] as [string, string]] : []),
    ...(description.writtenWith ? [['written with', description.writtenWith] as [string, string]] : []),
  ]
  const table = dom.appendChild(document.createElement('dl'))
  for (const [label, value] of rows) {
    table.appendChild(document.createElement('dt')).textContent = label
    table.appendChild(document.createElement('dd')).textContent = value
  }
  return dom
}

export const poiseHover = hoverTooltip((view, pos): Tooltip | null => {
  const line = view.state.doc.lineAt(pos)
  const constant = constantAt(lexLine(line.text), pos - line.from)
  if (constant) {
    return { pos: line.from + constant.from, end: line.from + constant.to, above: true, create: () => ({ dom: renderConstant(constant.description) }) }
  }
  const found = symbolAt(view.state, pos)
  if (!found) {
    const word = wordAt(view.state, pos)
    return word ? { pos: word.from, end: word.to, above: true, create: () => ({ dom: renderWord(word.description) }) } : null
  }
  return {
    pos: found.from,
    end: found.to,
    above: true,
    create: () => ({ dom: renderDescription(found.description) }),
  }
})
