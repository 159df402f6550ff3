/**
 * `limit dissolved X N UNIT` statements: which dissolved total they cap and
 * the cap in mol/L. X is an element symbol (`Ni`: every component's atoms of
 * nickel, a mass unit counted as the element) or a component (`Ni^2+`: its
 * dissolved total, a mass unit with its formula mass).
 */
import type { ModelComponent, ModelLimit } from './model'
import type { Reporter } from './reporter'
import type { Statement } from './statements'
import { ATOMIC_WEIGHTS, isElement } from './elements'
import { parseFormula, type Abbreviations } from './formula'
import { unitInfo, UNIT_HINTS } from './units'
import { checkRange, formatNumber } from './limits'

type LimitStatement = Extract<Statement, { kind: 'limit' }>

/** The formula of a component without its charge and phase: `Ni^2+` → `Ni`, `SO4^2-` → `SO4`. */
export function withoutCharge(name: string): string {
  return name.trim().replace(/\((?:s|g|aq|l)\)$/, '').replace(/\^\d*[+-]$/, '').replace(/(?<=[A-Za-z0-9)\]])[+-]$/, '')
}

const UNIT_WORDS = UNIT_HINTS.concentration

/**
 * What a dissolved total of X sums, for a limit and for a measured data
 * column (shared/fit): an element counts each component's atoms of it (a
 * mass unit as the element), a component itself alone (its formula mass).
 * Otherwise why not: in water itself (H, O), held by no component, neither
 * an element nor a component, or H+.
 */
export function dissolvedTarget(written: string, components: ModelComponent[], abbreviations?: Abbreviations):
  | { targetKind: ModelLimit['targetKind']; target: string; weights: number[]; grams: number | null }
  | 'water' | 'unheld' | 'unknown' | 'proton' {
  if (isElement(written)) {
    if (written === 'H' || written === 'O') return 'water'
    const weights = components.map((c) => c.elements[written] ?? 0)
    if (!weights.some((w) => w > 0)) return 'unheld'
    return { targetKind: 'element', target: written, weights, grams: ATOMIC_WEIGHTS[written] ?? null }
  }
  const name = parseFormula(written, abbreviations).formula?.name ?? written
  const j = components.findIndex((c) => c.name === name)
  if (j < 0) return 'unknown'
  if (name === 'H+') return 'proton'
  return { targetKind: 'component', target: name, weights: components.map((_, k) => (k === j ? 1 : 0)), grams: components[j]!.molarMass > 0 ? components[j]!.molarMass : null }
}

export function compileLimit(s: LimitStatement, components: ModelComponent[], hasSweep: boolean, report: Reporter, abbreviations?: Abbreviations): ModelLimit | null {
  const written = s.target.image
  const found = dissolvedTarget(written, components, abbreviations)
  if (found === 'water') {
    report.error('P084', `${written} is in water itself, so it has no dissolved total of its own: limit a component that holds it instead (such as \`limit dissolved NH3 …\`)`, s.target)
    return null
  }
  if (found === 'unheld') {
    const held = [...new Set(components.flatMap((c) => Object.keys(c.elements)).filter((e) => e !== 'H' && e !== 'O'))]
    report.error('P084', `no component holds ${written}: limit ${held.length ? `an element of the components (${held.join(', ')}) or ` : ''}a component such as ${components.find((c) => c.name !== 'H+')?.name ?? 'Ni^2+'}`, s.target)
    return null
  }
  if (found === 'unknown') {
    report.error('P084', `${written} is neither a component nor an element symbol: write a component of this file (${components.map((c) => c.name).join(', ')}) or an element one of them holds (such as Ni)`, s.target)
    return null
  }
  if (found === 'proton') {
    report.error('P084', 'H+ has no dissolved total (OH- holds −1 of it): limit another component, or the pH with a sweep', s.target)
    return null
  }
  const { targetKind, target, weights, grams } = found

  const q = s.quantity
  if (!q.unit) {
    report.error('P050', `expected ${UNIT_WORDS} after ${q.number.image}`, q.number)
    return null
  }
  const info = unitInfo(q.unit.image)
  if (!info || (info.dimension !== 'concentration' && info.dimension !== 'mass-concentration')) {
    report.error('P050', `${q.unit.image} is not ${UNIT_WORDS}: a limit caps a dissolved total`, q.unit)
    return null
  }
  if (!(q.value > 0)) {
    report.error('P085', `a limit must be above 0, not ${formatNumber(q.value)}`, q.number)
    return null
  }
  let molPerLitre = q.value * info.factor
  if (info.dimension === 'mass-concentration') {
    if (grams === null) {
      report.error('P051', `no molar mass for ${target}: give the limit in mol/L`, q.unit)
      return null
    }
    molPerLitre /= grams
  }
  if (!checkRange(report, 'concentration', molPerLitre, q.number, { what: 'the limit' })) return null
  if (!hasSweep) {
    report.warning('W109', `a limit is read along a sweep or a titration curve: add a \`sweep\` or \`titrate from\` line to see where dissolved ${withoutCharge(target)} is at or below ${q.number.image} ${q.unit.image} (a single solve does not use it)`, s.keyword)
  }
  return {
    quantity: `dissolved ${withoutCharge(target)}`,
    target, targetKind, value: q.value, unit: q.unit.image, molPerLitre, weights,
    line: report.lineOf(s.keyword.from),
  }
}
