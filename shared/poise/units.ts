/**
 * Units Poise accepts, each converted to the model's units: mol/L, atm,
 * degrees Celsius, kJ/mol, ångström. Mass concentrations need the molar mass of the
 * formula and are converted by the caller.
 */
export type Dimension = 'concentration' | 'mass-concentration' | 'pressure' | 'temperature' | 'enthalpy' | 'length' | 'volume'

interface UnitInfo { dimension: Dimension; factor: number; offset: number }

const u = (dimension: Dimension, factor: number, offset = 0): UnitInfo => ({ dimension, factor, offset })
const MICRO = ['u', 'µ', 'μ']

const table: Record<string, UnitInfo> = {
  'mol/L': u('concentration', 1), M: u('concentration', 1),
  'mmol/L': u('concentration', 1e-3), mM: u('concentration', 1e-3),
  'nmol/L': u('concentration', 1e-9), nM: u('concentration', 1e-9),
  'g/L': u('mass-concentration', 1), 'mg/L': u('mass-concentration', 1e-3),
  // Pressures to atm (1 atm = 101325 Pa, 1 bar = 100000 Pa; SI definitions).
  atm: u('pressure', 1), bar: u('pressure', 100000 / 101325), kPa: u('pressure', 1000 / 101325), Pa: u('pressure', 1 / 101325),
  C: u('temperature', 1), '°C': u('temperature', 1), K: u('temperature', 1, -273.15),
  // 1 thermochemical calorie = 4.184 J (definition).
  'kJ/mol': u('enthalpy', 1), 'J/mol': u('enthalpy', 1e-3), 'kcal/mol': u('enthalpy', 4.184),
  // Ion sizes to ångström (1 Å = 100 pm = 0.1 nm; the Å letter and the ångström sign both read).
  'Å': u('length', 1), 'Å': u('length', 1), pm: u('length', 0.01), nm: u('length', 10),
  // Volumes to litres (1 mL = 1e-3 L, 1 µL = 1e-6 L; SI prefixes).
  mL: u('volume', 1e-3),
}
for (const m of MICRO) {
  table[`${m}L`] = u('volume', 1e-6)
  table[`${m}mol/L`] = u('concentration', 1e-6)
  table[`${m}M`] = u('concentration', 1e-6)
  table[`${m}g/L`] = u('mass-concentration', 1e-6)
}
// After the prefixed volumes, so lists offer mL and µL before L.
table.L = u('volume', 1)

/** Every spelling the language reads as a unit (the keys of the table above). */
export const UNIT_SPELLINGS: readonly string[] = Object.keys(table)

/**
 * Units read only directly after a number: upper-case ones and lengths and
 * volumes that could be a formula or a word elsewhere (M, C, K, L, Pa, nm …).
 */
export const UNITS_AFTER_NUMBER_ONLY: ReadonlySet<string> = new Set(['J/mol', 'Pa', 'M', 'C', 'K', 'Å', 'Å', 'pm', 'nm', 'mL', 'L', ...MICRO.map((m) => `${m}L`)])

export function unitInfo(unit: string): UnitInfo | null {
  return Object.prototype.hasOwnProperty.call(table, unit) ? table[unit]! : null
}

/** Converts a value in a unit of the given dimension to model units; null when the unit is another dimension. */
export function convert(value: number, unit: string, dimension: Dimension): number | null {
  const info = unitInfo(unit)
  if (!info || info.dimension !== dimension) return null
  return value * info.factor + info.offset
}

export const UNIT_HINTS: Record<Dimension, string> = {
  concentration: 'a concentration unit, such as mmol/L or mg/L',
  'mass-concentration': 'a concentration unit, such as mmol/L or mg/L',
  pressure: 'a pressure unit: atm, bar, kPa or Pa',
  temperature: 'a temperature unit: C, °C or K',
  enthalpy: 'an enthalpy unit: kJ/mol, J/mol or kcal/mol',
  length: 'a length unit: Å, pm or nm',
  volume: 'a volume unit: mL, L, uL or µL',
}

/** Parses a Poise number: decimal, exponent, or `10^x`. */
export function parseNumber(image: string): number {
  const m = /^(-?)10\^(-?\d+(?:\.\d+)?)$/.exec(image)
  if (m) return (m[1] === '-' ? -1 : 1) * Math.pow(10, Number(m[2]))
  return Number(image)
}

/**
 * Shorthands of the trade that are not units: in dilute water (about 1 kg
 * per litre) ppm and ppb are read as mg/L and µg/L (common practice).
 */
const SHORTHANDS: Record<string, { unit: string; why: string }> = {
  ppm: { unit: 'mg/L', why: 'ppm is the trade\'s shorthand for mg/L in dilute water' },
  ppb: { unit: 'µg/L', why: 'ppb is the trade\'s shorthand for µg/L in dilute water' },
}

/** The units as they are offered: one spelling of micro (µ) and of ångström. */
export const UNIT_NAMES: readonly string[] = Object.keys(table).filter((k) => !/^[uμ]/.test(k) && k !== 'Å')

export function editDistance(a: string, b: string): number {
  const prev = Array.from({ length: b.length + 1 }, (_, j) => j)
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0]!
    prev[0] = i
    for (let j = 1; j <= b.length; j++) {
      const up = prev[j]!
      prev[j] = Math.min(up + 1, prev[j - 1]! + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1))
      diag = up
    }
  }
  return prev[b.length]!
}

/** How many edits a word may be from a unit (or a keyword) to count as meaning it: one for short words, two for longer. */
export const nearness = (word: string): number => (word.length <= 3 ? 1 : 2)

export interface UnitSuggestion {
  /** The nearest units, best first (at most three). */
  units: string[]
  /** Why the first one is meant, when the word is a known shorthand. */
  why: string | null
  /** True when one replacement is clearly meant (offered as a quick fix). */
  clear: boolean
  /** How the word was matched: only `near` (within a few edits) may as well be a misspelt keyword. */
  how: 'shorthand' | 'case' | 'prefix' | 'near'
}

/**
 * The units nearest to a word that is not one: a trade shorthand (ppm, ppb),
 * the same unit in other letter case (mg/l), a unit it begins (mmol → mmol/L),
 * or the units within two edits.
 */
export function suggestUnits(word: string, dimensions: readonly Dimension[] = []): UnitSuggestion {
  const short = SHORTHANDS[word.toLowerCase()]
  if (short) return { units: [short.unit], why: short.why, clear: true, how: 'shorthand' }
  const lower = word.toLowerCase()
  const norm = (u: string) => u.replace(/^[uμ]/, 'µ')
  const sameLetters = Object.keys(table).filter((u) => u.toLowerCase() === lower).map(norm)
  const unique = (xs: string[]) => [...new Set(xs)]
  if (sameLetters.length) return { units: unique(sameLetters).slice(0, 3), why: null, clear: unique(sameLetters).length === 1, how: 'case' }
  // Where the statement says which quantity it is, units of that quantity only (all units when none is near).
  const fits = (u: string) => dimensions.length === 0 || dimensions.includes(table[u]!.dimension)
  const begun = Object.keys(table).filter((u) => fits(u) && u.toLowerCase().startsWith(lower + '/')).map(norm)
  if (begun.length) return { units: unique(begun).slice(0, 3), why: null, clear: unique(begun).length === 1, how: 'prefix' }
  const near = (names: readonly string[]) => names.map((u) => ({ u, d: editDistance(lower, u.toLowerCase()) })).filter((s) => s.d <= nearness(lower)).sort((a, b) => a.d - b.d)
  const fitting = near(UNIT_NAMES.filter(fits))
  const scored = fitting.length ? fitting : near(UNIT_NAMES)
  const units = scored.slice(0, 3).map((s) => s.u)
  const clear = scored.length > 0 && (scored.length === 1 || scored[1]!.d > scored[0]!.d)
  return { units, why: null, clear, how: 'near' }
}

/** The message for a word written where a unit goes that is not one. */
export function notAUnitMessage(word: string, s: UnitSuggestion): string {
  if (s.why) return `${word} is not a unit: ${s.why}, so write ${s.units[0]}`
  if (s.clear) return `${word} is not a unit: write ${s.units[0]}`
  return `${word} is not a unit: did you mean ${s.units.slice(0, -1).join(', ')} or ${s.units[s.units.length - 1]}?`
}

const AMOUNT: Dimension[] = ['concentration', 'mass-concentration']
/** The quantity of a number by the word right before it. */
const BY_CLAUSE: Record<string, Dimension[]> = { pressure: ['pressure'], total: AMOUNT, free: AMOUNT, dH: ['enthalpy'], volume: ['volume'] }
/** Failing that, by the statement's first word. */
const BY_STATEMENT: Record<string, Dimension[]> = {
  temperature: ['temperature'], 'ionic-strength': ['concentration'], 'ion-size': ['length'], titrant: AMOUNT, limit: AMOUNT, titrate: ['volume'],
}
/** In a sweep, by its variable (a pH has no unit). */
const BY_SWEEP_VARIABLE: Record<string, Dimension[]> = { pH: [], temperature: ['temperature'], total: AMOUNT, pressure: ['pressure'] }

/**
 * The units the number at `index` of a line may take, from the words of its
 * line: the statement's first word, the variable of its sweep axis (a
 * sweep's second word, or for `map … by …` the word after the last `by`
 * before it), and the word right before the number. [] when the number
 * takes no unit or is not known (a coefficient, a pH, a count of points).
 * Read by the checker's "not a unit" message and by completion.
 */
export function quantityDimensions(words: readonly string[], index: number): Dimension[] {
  const before = words[index - 1]
  if (before === 'points' || before === '@' || before === 'pH') return []
  const byClause = before !== undefined ? BY_CLAUSE[before] : undefined
  if (byClause) return byClause
  const statement = words[0] ?? ''
  if (statement === 'sweep' || statement === 'map') {
    const by = words.lastIndexOf('by', index)
    return BY_SWEEP_VARIABLE[words[by >= 0 ? by + 1 : 1] ?? ''] ?? []
  }
  return BY_STATEMENT[statement] ?? []
}
