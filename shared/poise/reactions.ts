/**
 * Reactions: balance and constant-kind checks, then resolution. Each reaction
 * introduces exactly one new species; the resolver solves it for that species
 * and substitutes, in whatever order the file wrote them, until every species
 * is a product of components: log a(X) = logK(X) + Σ nu_j log a(component j).
 */
import type { ConstantKind } from './model'
import type { ParsedFormula } from './formula'
import type { Reporter } from './reporter'
import type { Statement, Tok } from './statements'
import { formatNumber } from './limits'

export type ReactionStatement = Extract<Statement, { kind: 'reaction' }>

export interface PreparedTerm { coefficient: number; formula: ParsedFormula; tok: Tok }
export interface PreparedReaction {
  left: PreparedTerm[]
  right: PreparedTerm[]
  kind: ConstantKind
  value: number
  /** log10 K of the reaction as written, at the reference temperature. */
  logK: number
  dH: number | null
  cite: string | null
  library: string | null
  /** `fit` was written: the constant is to be fitted (always false for a library's reaction in a system using it). */
  fit: boolean
  /** The ± as written, in the kind's own units; null when none. */
  uncertainty: number | null
  /** Standard uncertainty of log10 K of the reaction as written; null when none. */
  logKUncertainty: number | null
  line: number
  stmt: ReactionStatement
}

/**
 * `weights`: log K of the formation as Σ weight × logK of the reactions it was
 * chained through (empty for a component's free form).
 */
export interface FormationData { nu: number[]; logK: number; dH: number | null; weights: Map<PreparedReaction, number> }
export interface Known { formation: FormationData; formula: ParsedFormula; line: number; byReaction: PreparedReaction | null }

const WATER = 'H2O'

/**
 * Standard uncertainty of log10 K from a ± in the kind's own units: the same
 * number for log and p kinds; σ/(K·ln 10) for K, Ka, beta and Ksp (first-order
 * propagation through log10). Null when K ≤ 0.
 */
export function logKUncertaintyFromConstant(kind: ConstantKind, value: number, uncertainty: number): number | null {
  switch (kind) {
    case 'logK': case 'logbeta': case 'logKsp': case 'logKH': case 'pK': case 'pKa': case 'pKsp': case 'pKw': return uncertainty
    case 'K': case 'beta': case 'Ka': case 'Ksp': return value > 0 ? uncertainty / (value * Math.LN10) : null
  }
}

/** log10 K of the reaction as written, from the constant's kind and value; null when K ≤ 0. */
export function logKFromConstant(kind: ConstantKind, value: number): number | null {
  switch (kind) {
    case 'logK': case 'logbeta': case 'logKsp': case 'logKH': return value
    case 'pK': case 'pKa': case 'pKsp': case 'pKw': return -value
    case 'K': case 'beta': case 'Ka': case 'Ksp': return value > 0 ? Math.log10(value) : null
  }
}

/**
 * The inverse of logKFromConstant: the number written after the kind for a
 * log10 K, and how a standard error of log10 K reads in the kind (the same
 * for log and p kinds; ln 10 · K · σ for K, β, Ka and Ksp, to first order).
 */
export function constantFromLogK(kind: ConstantKind, logK: number, logKError = 0): { value: number; error: number } {
  switch (kind) {
    case 'logK': case 'logbeta': case 'logKsp': case 'logKH': return { value: logK, error: logKError }
    case 'pK': case 'pKa': case 'pKsp': case 'pKw': return { value: -logK, error: logKError }
    case 'K': case 'beta': case 'Ka': case 'Ksp': {
      const value = Math.pow(10, logK)
      return { value, error: Math.LN10 * value * logKError }
    }
  }
}

/** Element counts and charge of the left side minus the right side. */
function imbalance(left: PreparedTerm[], right: PreparedTerm[]): { elements: Map<string, number>; leftCharge: number; rightCharge: number } {
  const elements = new Map<string, number>()
  let leftCharge = 0
  let rightCharge = 0
  for (const t of left) {
    const counts = t.formula.elements
    for (const el in counts) elements.set(el, (elements.get(el) ?? 0) + counts[el]! * t.coefficient)
    leftCharge += t.formula.charge * t.coefficient
  }
  for (const t of right) {
    const counts = t.formula.elements
    for (const el in counts) elements.set(el, (elements.get(el) ?? 0) - counts[el]! * t.coefficient)
    rightCharge += t.formula.charge * t.coefficient
  }
  return { elements, leftCharge, rightCharge }
}

const fmt = formatNumber

/** Reports element and charge imbalance; true when the reaction balances. */
export function checkBalance(left: PreparedTerm[], right: PreparedTerm[], stmt: ReactionStatement, report: Reporter): boolean {
  const net = imbalance(left, right)
  const diffs: string[] = []
  // Messages only for a reaction that does not balance, in element order.
  for (const [el, d] of [...net.elements].filter(([, d]) => Math.abs(d) > 1e-9).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))) {
    diffs.push(d > 0 ? `left side has ${fmt(d)} more ${el} than right` : `right side has ${fmt(-d)} more ${el} than left`)
  }
  let ok = true
  const at = { from: stmt.left[0]!.formula.from, to: stmt.constantKind.from > 0 ? lastFormulaEnd(stmt) : stmt.to }
  if (diffs.length) {
    report.error('P020', `the reaction does not balance: ${diffs.join('; ')}`, at)
    ok = false
  }
  const dz = net.leftCharge - net.rightCharge
  if (Math.abs(dz) > 1e-9) {
    const sign = (z: number) => (z > 0 ? `+${fmt(z)}` : fmt(z))
    report.error('P021', `the charge does not balance: left side ${sign(net.leftCharge)}, right side ${sign(net.rightCharge)} (differs by ${fmt(Math.abs(dz))})`, at)
    ok = false
  }
  return ok
}

function lastFormulaEnd(stmt: ReactionStatement): number {
  return stmt.right[stmt.right.length - 1]!.formula.to
}

const only = (terms: PreparedTerm[], pred: (t: PreparedTerm) => boolean) => terms.filter((t) => t.formula.name !== WATER && pred(t))

/** Checks that the constant's kind fits the reaction's shape; returns a message when it does not. */
export function kindMismatch(kind: ConstantKind, left: PreparedTerm[], right: PreparedTerm[], isComponent: (name: string) => boolean): string | null {
  switch (kind) {
    case 'logK': case 'K': case 'pK': return null
    case 'logbeta': case 'beta':
      if (!left.every((t) => isComponent(t.formula.name))) {
        const other = left.find((t) => !isComponent(t.formula.name))!
        return `${kind} is a cumulative formation constant: its left side holds only components, but ${other.formula.name} is not one (use logK for a stepwise constant)`
      }
      return right.length === 1 && right[0]!.coefficient === 1 ? null : `${kind} forms one species: its right side must hold exactly one species (use logK otherwise)`
    case 'pKa': case 'Ka': {
      const h = right.filter((t) => t.formula.name === 'H+')
      return h.length === 1 && h[0]!.coefficient === 1 ? null : `${kind} is an acid dissociation constant: the right side must release exactly one H+ (write the reaction as acid <=> base + H+, or use logK)`
    }
    case 'pKsp': case 'Ksp': case 'logKsp': {
      const solids = only(left, () => true)
      return solids.length === 1 && solids[0]!.formula.phase === 's' && solids[0]!.coefficient === 1 ? null : `${kind} is a solubility product: the left side must be exactly one solid, such as CaCO3(s) <=> Ca^2+ + CO3^2-`
    }
    case 'pKw': {
      const names = (ts: PreparedTerm[]) => ts.map((t) => `${t.coefficient} ${t.formula.name}`).sort().join(',')
      return names(left) === '1 H2O' && names(right) === '1 H+,1 OH-' ? null : 'pKw belongs only to the water reaction H2O <=> H+ + OH-'
    }
    case 'logKH': {
      const gases = only(left, () => true)
      return gases.length === 1 && gases[0]!.formula.phase === 'g' && gases[0]!.coefficient === 1 ? null : 'logKH is a Henry constant: the left side must be one gas, such as CO2(g) + H2O <=> H2CO3'
    }
  }
}

const netCache = new WeakMap<PreparedReaction, Map<string, { s: number; term: PreparedTerm }>>()

/** Net coefficient of each species (products positive), water included; computed once per reaction. */
function netCoefficients(r: PreparedReaction): Map<string, { s: number; term: PreparedTerm }> {
  const cached = netCache.get(r)
  if (cached) return cached
  const net = new Map<string, { s: number; term: PreparedTerm }>()
  const add = (t: PreparedTerm, sign: number) => {
    const prev = net.get(t.formula.name)
    net.set(t.formula.name, { s: (prev?.s ?? 0) + sign * t.coefficient, term: prev?.term ?? t })
  }
  r.left.forEach((t) => add(t, -1))
  r.right.forEach((t) => add(t, 1))
  for (const [k, v] of net) if (Math.abs(v.s) < 1e-12) net.delete(k)
  netCache.set(r, net)
  return net
}

function unknownsOf(r: PreparedReaction, known: Map<string, Known>): string[] {
  const out: string[] = []
  for (const name of netCoefficients(r).keys()) if (!known.has(name)) out.push(name)
  return out
}

/** Solves reaction r for its one unknown species and records it. */
function define(r: PreparedReaction, unknown: string, known: Map<string, Known>, width: number): void {
  const net = netCoefficients(r)
  const target = net.get(unknown)!
  const nu = new Array<number>(width).fill(0)
  let logK = r.logK
  let dH: number | null = r.dH
  const weights = new Map<PreparedReaction, number>([[r, 1]])
  for (const [name, { s }] of net) {
    if (name === unknown) continue
    const k = known.get(name)!.formation
    for (let j = 0; j < width; j++) nu[j]! -= s * k.nu[j]!
    logK -= s * k.logK
    dH = dH === null || k.dH === null ? null : dH - s * k.dH
    for (const [q, w] of k.weights) weights.set(q, (weights.get(q) ?? 0) - s * w)
  }
  const clean = (x: number) => (Math.abs(x) < 1e-12 ? 0 : x)
  for (const [q, w] of weights) {
    const v = clean(w / target.s)
    if (v === 0) weights.delete(q)
    else weights.set(q, v)
  }
  known.set(unknown, {
    formation: { nu: nu.map((x) => clean(x / target.s)), logK: logK / target.s, dH: dH === null ? null : dH / target.s, weights },
    formula: target.term.formula,
    line: r.line,
    byReaction: r,
  })
}

/** A reaction whose species are all components or already defined, and which still relates components. */
export interface Relation { reaction: PreparedReaction; message: string }

export interface Resolution {
  used: PreparedReaction[]
  defines: Map<PreparedReaction, string>
  /** Library reactions left unused that relate the file's components (the caller reports them at the `use` line). */
  libraryRelations: Relation[]
}

/**
 * The reaction expanded in components (Σ s·nu over its species): zero when it
 * only repeats how its species are made, non-zero when it relates components
 * that are declared independent. Then the message names what to change.
 */
function relation(r: PreparedReaction, known: Map<string, Known>, componentNames: readonly string[]): string | null {
  const width = componentNames.length
  const v = new Array<number>(width).fill(0)
  for (const [name, { s }] of netCoefficients(r)) {
    const k = known.get(name)
    if (!k) return null
    for (let j = 0; j < width; j++) v[j]! += s * (k.formation.nu[j] ?? 0)
  }
  const involved = componentNames.filter((_, j) => Math.abs(v[j]!) > 1e-9)
  if (involved.length === 0) return null
  const last = involved[involved.length - 1]!
  const others = involved.slice(0, -1)
  const through = [...netCoefficients(r).keys()].filter((n) => known.get(n)?.byReaction).map((n) => `${n}, line ${known.get(n)!.line}`)
  const via = through.length ? ` (through ${through.join('; ')})` : ''
  if (others.length === 0) {
    return `this reaction fixes component ${last} by itself${via}: components must be independent, so remove \`component ${last}\` and let the reaction define it, or remove the reaction`
  }
  return `this reaction relates components that must be independent: with it, ${last} is made of ${others.join(', ')}${via} and water. Remove \`component ${last}\` and let this reaction define it, or remove the reaction`
}

/**
 * Resolves the file's reactions (each must define one species) and, where they
 * need it, the libraries' reactions (used only when they define something new).
 */
export function resolveReactions(fileReactions: PreparedReaction[], libraryReactions: PreparedReaction[], known: Map<string, Known>, componentNames: readonly string[], report: Reporter, suppressUndefined: boolean): Resolution {
  const width = componentNames.length
  const used: PreparedReaction[] = []
  const defines = new Map<PreparedReaction, string>()
  let pendingFile = [...fileReactions]
  let pendingLib = [...libraryReactions]
  for (;;) {
    let progress = false
    const still: PreparedReaction[] = []
    for (const r of pendingFile) {
      const u = unknownsOf(r, known)
      if (u.length === 1) {
        define(r, u[0]!, known, width)
        defines.set(r, u[0]!)
        used.push(r)
        progress = true
      } else still.push(r)
    }
    pendingFile = still
    if (progress) continue
    const libIndex = pendingLib.findIndex((r) => unknownsOf(r, known).length === 1)
    if (libIndex < 0) break
    const r = pendingLib[libIndex]!
    const u = unknownsOf(r, known)[0]!
    define(r, u, known, width)
    defines.set(r, u)
    used.push(r)
    pendingLib = pendingLib.filter((_, i) => i !== libIndex)
  }
  reportStuck(pendingFile, known, componentNames, report, suppressUndefined)
  const libraryRelations: Relation[] = []
  for (const r of pendingLib) {
    if (unknownsOf(r, known).length > 0) continue
    const message = relation(r, known, componentNames)
    if (message) libraryRelations.push({ reaction: r, message })
  }
  return { used, defines, libraryRelations }
}

function reportStuck(stuck: PreparedReaction[], known: Map<string, Known>, componentNames: readonly string[], report: Reporter, suppressUndefined: boolean): void {
  const occurrences = new Map<string, number>()
  for (const r of stuck) for (const name of unknownsOf(r, known)) occurrences.set(name, (occurrences.get(name) ?? 0) + 1)
  const reportedUndefined = new Set<string>()
  for (const r of stuck) {
    const net = netCoefficients(r)
    const unknown = unknownsOf(r, known)
    const at = { from: r.stmt.left[0]!.formula.from, to: lastFormulaEnd(r.stmt) }
    if (unknown.length === 0) {
      // A component that failed its own checks stands in with no stoichiometry: its error says enough.
      if ([...net.keys()].some((n) => n !== WATER && known.get(n)!.formula.name !== n)) continue
      const related = relation(r, known, componentNames)
      if (related) {
        report.error('P060', related, at)
        continue
      }
      const already = [...net.keys()].map((n) => known.get(n)!).filter((k) => k.byReaction)
      if (already.length === 1) {
        const k = already[0]!
        report.error('P031', `${k.formula.name} is defined twice: the reaction on line ${k.line}${k.byReaction!.library ? ` of library "${k.byReaction!.library}"` : ''} defines it already. Keep one of the two`, net.get(k.formula.name)!.term.tok)
        continue
      }
      const where = already.length ? `: ${already.map((k) => `${k.formula.name} is already defined on line ${k.line}`).join(', ')}` : ': all its species are components'
      report.error('P032', `this reaction introduces no new species${where}. Remove it, or write it for a species nothing else defines`, at)
      continue
    }
    const shared = unknown.filter((n) => (occurrences.get(n) ?? 0) > 1)
    if (shared.length > 0 && shared.length < unknown.length) {
      if (suppressUndefined) continue
      for (const name of shared) {
        if (reportedUndefined.has(name)) continue
        reportedUndefined.add(name)
        const term = net.get(name)!.term
        report.error('P030', `${name} is used but never defined: declare it as a component or add a reaction that forms it`, term.tok)
      }
      continue
    }
    if (suppressUndefined) continue
    report.error('P033', `this reaction introduces ${unknown.length} new species (${unknown.join(', ')}); each reaction must introduce exactly one. Declare all but one as components, or define them first with other reactions`, at)
  }
}
