/**
 * What changed in the chemistry between two compiled models: species, solids
 * and gases added or removed, formation constants moved (old → new and the
 * change in log K), totals and conditions changed, a solid allowed to form or
 * suppressed, an ion size of the extended Debye–Hückel model moved, citations
 * changed, a constant's ± or `fit` mark changed.
 *
 * Constants are compared as the model uses them — the log10 formation
 * constant from components at the reference temperature — so rewriting a
 * reaction in another form (pKa instead of logK) without changing its value
 * is not reported as a change of the chemistry. Pure data in, pure data out:
 * no Vue, no Nitro.
 */
import type { Model, ModelComponent, ModelReaction } from '../poise/model'

export type ModelChangeKind =
  | 'added' | 'removed'
  | 'constant' | 'total' | 'condition' | 'assumption' | 'citation'

export type ModelEntity = 'species' | 'solid' | 'gas' | 'component' | 'condition'

export interface ModelChange {
  kind: ModelChangeKind
  entity: ModelEntity
  /** The species, solid, gas or component in caret form, or the condition's name. */
  name: string
  /** Old and new values in words ready to show, e.g. "logK 4.00" → "logK 5.00". */
  from: string | null
  to: string | null
  /** For constants: new log K minus old (at the reference temperature). */
  deltaLogK?: number
  /** For constants: the log10 formation constants from components behind `from` and `to`. */
  logK?: { from: number; to: number }
  /** How large the change is, for ordering: log10 units for constants and totals. */
  size: number
  /** 1-based source lines in the old and new file, when the change has one. */
  fromLine?: number
  toLine?: number
}

/** Structural changes (a species that appears or goes) outrank any numeric one. */
const STRUCTURAL_SIZE = 1000
/** Conditions that change the whole model (activity model, temperature) come next. */
const CONDITION_SIZE = 100

function fixed(value: number, digits = 2): string {
  return Number.isFinite(value) ? value.toFixed(digits) : String(value)
}

function quantity(value: number): string {
  if (value === 0) return '0'
  const abs = Math.abs(value)
  return abs >= 0.01 && abs < 1000 ? String(Number(value.toPrecision(4))) : value.toExponential(2)
}

/** log10 distance between two positive amounts; a sign change or zero counts as structural-sized. */
function logDistance(a: number, b: number): number {
  if (a === b) return 0
  if (a > 0 && b > 0) return Math.abs(Math.log10(b / a))
  return CONDITION_SIZE / 10
}

function componentValue(c: ModelComponent): string {
  switch (c.mode) {
    case 'total': return `total ${quantity(c.value)} mol/L`
    case 'free': return `free ${quantity(c.value)} mol/L`
    case 'pH': return `pH ${fixed(c.value)}`
    case 'pressure': return `pressure ${quantity(c.value)} atm`
    case 'balance': return 'balance (charge)'
    case 'excess': return 'excess solid'
  }
}

interface Formed { name: string; logKRef: number; line: number; entity: ModelEntity; suppressed?: boolean; written: string | null }

/** Kinds whose number is the constant itself rather than its logarithm. */
const LINEAR_KINDS = new Set(['K', 'beta', 'Ka', 'Ksp'])

/** The constant as the file wrote it (`pKsp 19.66`), or null for a species no reaction of the file defines. */
function writtenConstant(model: Model, name: string): string | null {
  const reaction = model.reactions.find(r => r.defines === name)
  if (!reaction) return null
  return `${reaction.kind} ${LINEAR_KINDS.has(reaction.kind) ? reaction.value.toExponential(2) : fixed(reaction.value)}`
}

function formedOf(model: Model): Map<string, Formed> {
  const map = new Map<string, Formed>()
  // A component's free form is a species of the model too, with logK 0: it is reported as a component instead.
  const entry = (name: string, logKRef: number, line: number, entity: ModelEntity, suppressed?: boolean): Formed =>
    ({ name, logKRef, line, entity, suppressed, written: writtenConstant(model, name) })
  for (const s of model.species) if (s.componentIndex === null) map.set(`species:${s.name}`, entry(s.name, s.logKRef, s.line, 'species'))
  for (const s of model.solids) map.set(`solid:${s.name}`, entry(s.name, s.logKRef, s.line, 'solid', s.suppressed))
  for (const g of model.gases) map.set(`gas:${g.name}`, entry(g.name, g.logKRef, g.line, 'gas'))
  return map
}

function formationChanges(a: Model, b: Model): ModelChange[] {
  const before = formedOf(a)
  const after = formedOf(b)
  const changes: ModelChange[] = []
  for (const [key, old] of before) {
    const now = after.get(key)
    if (!now) {
      changes.push({ kind: 'removed', entity: old.entity, name: old.name, from: `log K ${fixed(old.logKRef)}`, to: null, size: STRUCTURAL_SIZE, fromLine: old.line })
      continue
    }
    if (old.suppressed !== now.suppressed) {
      const words = (suppressed?: boolean) => suppressed ? 'never precipitates' : 'may precipitate'
      changes.push({ kind: 'assumption', entity: old.entity, name: old.name, from: words(old.suppressed), to: words(now.suppressed), size: CONDITION_SIZE, fromLine: old.line, toLine: now.line })
    }
    const delta = now.logKRef - old.logKRef
    // Constants are written with two or three decimals: differences below that are rounding of a rewritten reaction.
    if (Math.abs(delta) >= 5e-4) {
      // As written when the text of the constant changed; else it moved through another reaction it is built from.
      const asWritten = old.written !== null && now.written !== null && old.written !== now.written
      changes.push({
        kind: 'constant', entity: old.entity, name: old.name,
        from: asWritten ? old.written : `log K ${fixed(old.logKRef)}`,
        to: asWritten ? now.written : `log K ${fixed(now.logKRef)}`,
        deltaLogK: delta, logK: { from: old.logKRef, to: now.logKRef },
        size: Math.abs(delta), fromLine: old.line, toLine: now.line,
      })
    }
  }
  for (const [key, now] of after) {
    if (!before.has(key)) changes.push({ kind: 'added', entity: now.entity, name: now.name, from: null, to: `log K ${fixed(now.logKRef)}`, size: STRUCTURAL_SIZE, toLine: now.line })
  }
  return changes
}

function componentChanges(a: Model, b: Model): ModelChange[] {
  const changes: ModelChange[] = []
  const after = new Map(b.components.map(c => [c.name, c]))
  for (const old of a.components) {
    const now = after.get(old.name)
    if (!now) {
      changes.push({ kind: 'removed', entity: 'component', name: old.name, from: componentValue(old), to: null, size: STRUCTURAL_SIZE, fromLine: old.line })
      continue
    }
    if (old.mode === now.mode && old.value === now.value) continue
    const size = old.mode !== now.mode
      ? CONDITION_SIZE / 10
      : old.mode === 'pH' ? Math.abs(now.value - old.value) : logDistance(old.value, now.value)
    changes.push({ kind: 'total', entity: 'component', name: old.name, from: componentValue(old), to: componentValue(now), size, fromLine: old.line, toLine: now.line })
  }
  const before = new Set(a.components.map(c => c.name))
  for (const now of b.components) {
    if (!before.has(now.name)) changes.push({ kind: 'added', entity: 'component', name: now.name, from: null, to: componentValue(now), size: STRUCTURAL_SIZE, toLine: now.line })
  }
  return changes
}

function sweepText(model: Model): string | null {
  return model.sweep ? axisText(model.sweep) : null
}

/** A map in words: its two axes. */
function mapText(model: Model): string | null {
  return model.map ? `${axisText(model.map.x)} by ${axisText(model.map.y)}` : null
}

function axisText(s: NonNullable<Model['sweep']>): string {
  const first = s.values[0]
  const last = s.values[s.values.length - 1]
  const what = s.component ? `${s.variable} of ${s.component}` : s.variable
  return `${what} from ${quantity(first ?? 0)} to ${quantity(last ?? 0)}, ${s.values.length} points${s.log ? ' (log)' : ''}`
}

function conditionChanges(a: Model, b: Model): ModelChange[] {
  const changes: ModelChange[] = []
  const condition = (name: string, from: string | null, to: string | null, size: number) => {
    if (from !== to) changes.push({ kind: 'condition', entity: 'condition', name, from, to, size })
  }
  condition('temperature', `${fixed(a.temperatureC, 1)} °C`, `${fixed(b.temperatureC, 1)} °C`, CONDITION_SIZE + Math.abs(b.temperatureC - a.temperatureC) / 100)
  condition('activity model', a.activity, b.activity, CONDITION_SIZE)
  const ionic = (m: Model) => m.fixedIonicStrength === null ? 'from the species' : `${quantity(m.fixedIonicStrength)} mol/L`
  condition('ionic strength', ionic(a), ionic(b), CONDITION_SIZE)
  condition('sweep', sweepText(a), sweepText(b), 1)
  condition('map', mapText(a), mapText(b), 1)
  // Which library revisions the constants came from: a moved library can change many constants at once.
  const libraries = (m: Model) => m.libraries.map(l => `${l.name} @ ${l.revision}`).sort().join(', ') || 'none'
  condition('libraries used', libraries(a), libraries(b), CONDITION_SIZE)
  return changes
}

const ION_SIZE_FROM = { file: 'ion-size', table: 'built-in table', charge: 'guessed from the charge' } as const

/** Ion sizes of the extended Debye–Hückel model that moved, when either revision uses that model. */
function ionSizeChanges(a: Model, b: Model): ModelChange[] {
  if (a.activity !== 'debye-huckel' && b.activity !== 'debye-huckel') return []
  const words = (s: Model['species'][number]) => s.ionSize === undefined ? 'built-in default' : `${s.ionSize} Å (${ION_SIZE_FROM[s.ionSizeSource ?? 'table']})`
  const before = new Map(a.species.map(s => [s.name, s]))
  const changes: ModelChange[] = []
  for (const now of b.species) {
    const old = before.get(now.name)
    if (!old || old.charge === 0 || old.ionSize === now.ionSize) continue
    changes.push({ kind: 'assumption', entity: 'species', name: now.name, from: words(old), to: words(now), size: 0.5, fromLine: old.line, toLine: now.line })
  }
  return changes
}

function citationChanges(a: Model, b: Model): ModelChange[] {
  const byDefined = (model: Model) => new Map<string, ModelReaction>(model.reactions.map(r => [r.defines, r]))
  const before = byDefined(a)
  const changes: ModelChange[] = []
  for (const now of b.reactions) {
    const old = before.get(now.defines)
    if (!old || old.cite === now.cite) continue
    const entity: ModelEntity = b.solids.some(x => x.name === now.defines) ? 'solid' : b.gases.some(x => x.name === now.defines) ? 'gas' : 'species'
    changes.push({
      kind: 'citation', entity, name: now.defines,
      from: old.cite ?? 'no citation', to: now.cite ?? 'no citation',
      size: now.cite === null ? 0.5 : 0, fromLine: old.line, toLine: now.line,
    })
  }
  return changes
}

/** A constant's ± or its `fit` mark that changed (models stored before uncertainties read as none). */
function uncertaintyChanges(a: Model, b: Model): ModelChange[] {
  const before = new Map<string, ModelReaction>(a.reactions.map(r => [r.defines, r]))
  const words = (r: ModelReaction) => `${r.uncertainty == null ? 'no ±' : `${r.kind} ± ${quantity(r.uncertainty)}`}${r.fit ? ', fit' : ''}`
  const changes: ModelChange[] = []
  for (const now of b.reactions) {
    const old = before.get(now.defines)
    if (!old || words(old) === words(now)) continue
    const entity: ModelEntity = b.solids.some(x => x.name === now.defines) ? 'solid' : b.gases.some(x => x.name === now.defines) ? 'gas' : 'species'
    changes.push({ kind: 'assumption', entity, name: now.defines, from: words(old), to: words(now), size: 0.25, fromLine: old.line, toLine: now.line })
  }
  return changes
}

/**
 * Every change from `a` (the old revision) to `b` (the new), largest first:
 * species appearing or going, then conditions, then constants and totals by
 * how many log10 units they moved, then citations.
 */
export function diffModels(a: Model, b: Model): ModelChange[] {
  const changes = [
    ...formationChanges(a, b),
    ...componentChanges(a, b),
    ...conditionChanges(a, b),
    ...ionSizeChanges(a, b),
    ...citationChanges(a, b),
    ...uncertaintyChanges(a, b),
  ]
  return changes.sort((x, y) => y.size - x.size || x.name.localeCompare(y.name))
}
