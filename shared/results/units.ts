/**
 * Units results are shown in: mol/L, mmol/L, µmol/L, mg/L, µg/L. Their
 * factors come from the language's unit table (shared/poise/units.ts) and
 * the molar masses from its IUPAC atomic weights (shared/poise/elements.ts),
 * so an input of 1 mg/L and an output of 1 mg/L are the same amount. The
 * Result itself always stays in mol/L; these convert for display, the CSV,
 * the report and the command line.
 *
 * A mass unit needs what a mole of the quantity weighs: a species' or
 * component's formula mass, or, for a component reported "as element", the
 * mass of the one element it is counted by (dissolved Ni as Ni, ammonia as
 * N, sulfate as S, phosphate as P).
 */
import { ATOMIC_WEIGHTS, molarMassOf } from '../poise/elements'
import { unitInfo } from '../poise/units'

export const OUTPUT_UNITS = ['mol/L', 'mmol/L', 'µmol/L', 'mg/L', 'µg/L'] as const
export type OutputUnit = (typeof OUTPUT_UNITS)[number]
export const DEFAULT_OUTPUT_UNIT: OutputUnit = 'mol/L'

/** Accepts the spellings the language accepts for the same units (`umol/L`, `ug/L`, `M`…), giving the shown one. */
export function parseOutputUnit(text: unknown): OutputUnit | null {
  if (typeof text !== 'string') return null
  const info = unitInfo(text.trim())
  if (!info || (info.dimension !== 'concentration' && info.dimension !== 'mass-concentration')) return null
  return OUTPUT_UNITS.find((u) => {
    const other = unitInfo(u)!
    return other.dimension === info.dimension && other.factor === info.factor
  }) ?? null
}

export function isMassUnit(unit: OutputUnit): boolean {
  return unitInfo(unit)!.dimension === 'mass-concentration'
}

/** What a mole of a shown quantity weighs, g/mol, and the element it is counted as (null: the whole formula). */
export interface MassBasis {
  grams: number | null
  asElement: string | null
}

/** The whole formula: its molar mass (null when an element has no standard atomic weight). */
export function formulaBasis(elements: Record<string, number>): MassBasis {
  return { grams: molarMassOf(elements), asElement: null }
}

/**
 * The element a component is counted as: its one element besides H and O
 * (Ni²⁺ → Ni, NH₃ → N, SO₄²⁻ → S, PO₄³⁻ → P, CO₃²⁻ → C); null when it has
 * none or several (Cu(NH₃)₄²⁺, H⁺, OH⁻).
 */
export function reportingElement(elements: Record<string, number>): string | null {
  const others = Object.keys(elements).filter((e) => e !== 'H' && e !== 'O' && (elements[e] ?? 0) > 0)
  return others.length === 1 ? others[0]! : null
}

/** A component counted as its reporting element (or the element given): count × atomic weight. Null when it has no such element. */
export function elementBasis(elements: Record<string, number>, symbol: string | null = reportingElement(elements)): MassBasis | null {
  if (!symbol) return null
  const count = elements[symbol] ?? 0
  const weight = ATOMIC_WEIGHTS[symbol]
  if (!(count > 0) || weight === null || weight === undefined) return null
  return { grams: count * weight, asElement: symbol }
}

/**
 * A concentration in mol/L in the unit asked for; null when the unit is a
 * mass unit and the basis has no molar mass. NaN stays NaN.
 */
export function fromMolar(molPerLitre: number, unit: OutputUnit, basis: MassBasis | null): number | null {
  const info = unitInfo(unit)!
  if (info.dimension === 'concentration') return molPerLitre / info.factor
  if (!basis || basis.grams === null) return null
  return (molPerLitre * basis.grams) / info.factor
}

/** The inverse of `fromMolar`: a value in the unit, in mol/L. */
export function toMolar(value: number, unit: OutputUnit, basis: MassBasis | null): number | null {
  const info = unitInfo(unit)!
  if (info.dimension === 'concentration') return value * info.factor
  if (!basis || basis.grams === null || basis.grams <= 0) return null
  return (value * info.factor) / basis.grams
}

/** The unit as a header shows it: `mg/L`, or `mg/L as N` for a component counted as an element. */
export function unitLabel(unit: OutputUnit, basis: MassBasis | null = null): string {
  return isMassUnit(unit) && basis?.asElement ? `${unit} as ${basis.asElement}` : unit
}

/** A system's output-unit choice, remembered per system in the browser. */
export interface UnitPrefs {
  unit: OutputUnit
  /** Components in a mass unit counted as their element (Ni as Ni, NH₃ as N). */
  asElement: boolean
}

export function unitPrefsKey(systemKey: string): string {
  return `equipoise:units:${systemKey}`
}

/** Parse stored preferences; anything unreadable gives the default (mol/L, whole formula). */
export function parseUnitPrefs(raw: string | null): UnitPrefs {
  const fallback: UnitPrefs = { unit: DEFAULT_OUTPUT_UNIT, asElement: false }
  if (!raw) return fallback
  let value: unknown
  try {
    value = JSON.parse(raw)
  } catch {
    return fallback
  }
  if (typeof value !== 'object' || value === null) return fallback
  const record = value as Record<string, unknown>
  return { unit: parseOutputUnit(record.unit) ?? DEFAULT_OUTPUT_UNIT, asElement: record.asElement === true }
}

export function serializeUnitPrefs(prefs: UnitPrefs): string {
  return JSON.stringify({ unit: prefs.unit, asElement: prefs.asElement })
}

/** The part of a compiled model the conversions need (a whole `Model` fits). */
export interface UnitModel {
  components: { name: string; elements: Record<string, number> }[]
  species: { name: string; elements: Record<string, number> }[]
}

/** What one unit choice does to the numbers of a model's results: a factor from mol/L per species and per component. */
export interface UnitScale {
  unit: OutputUnit
  /** mol/L × factor = the value in `unit`; null when a mass unit has no molar mass for it. */
  species: (name: string) => number | null
  component: (name: string) => number | null
  /** The unit as headers write it for a component: `mg/L as Ni` when counted as an element. */
  componentUnit: (name: string) => string
}

/** The basis of a component's mass: as its element when asked and it has one, else its formula. */
export function componentBasis(elements: Record<string, number>, asElement: boolean): MassBasis {
  return (asElement ? elementBasis(elements) : null) ?? formulaBasis(elements)
}

export function unitScale(model: UnitModel | null, choice: UnitPrefs): UnitScale {
  const speciesElements = new Map((model?.species ?? []).map((s) => [s.name, s.elements]))
  const componentElements = new Map((model?.components ?? []).map((c) => [c.name, c.elements]))
  const mass = isMassUnit(choice.unit)
  const factor = (elements: Record<string, number> | undefined, basis: (e: Record<string, number>) => MassBasis) =>
    mass ? (elements ? fromMolar(1, choice.unit, basis(elements)) : null) : fromMolar(1, choice.unit, null)
  const basisOf = (name: string) => {
    const elements = componentElements.get(name)
    return elements ? componentBasis(elements, choice.asElement) : null
  }
  return {
    unit: choice.unit,
    species: (name) => factor(speciesElements.get(name) ?? componentElements.get(name), formulaBasis),
    component: (name) => factor(componentElements.get(name), (e) => componentBasis(e, choice.asElement)),
    componentUnit: (name) => unitLabel(choice.unit, basisOf(name)),
  }
}

/** The scale of mol/L: every factor 1. */
export const MOLAR_SCALE: UnitScale = unitScale(null, { unit: 'mol/L', asElement: false })

/** g/mol of CaCO3 from the same IUPAC weights: the unit hardness is reported in. */
export const CACO3_GRAMS = molarMassOf({ Ca: 1, C: 1, O: 3 })!

/**
 * Total hardness of a natural water: the dissolved calcium and magnesium
 * (components Ca²⁺ and Mg²⁺), mol/L, which the trade reports as CaCO3 (one
 * CaCO3 for each Ca or Mg). Null when the system has neither.
 */
export function hardness(components: { name: string; dissolved?: number }[]): number | null {
  const held = components.filter((c) => (c.name === 'Ca^2+' || c.name === 'Mg^2+') && c.dissolved !== undefined)
  return held.length ? held.reduce((sum, c) => sum + c.dissolved!, 0) : null
}
