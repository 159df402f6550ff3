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
  L: u('volume', 1), mL: u('volume', 1e-3),
}
for (const m of MICRO) {
  table[`${m}L`] = u('volume', 1e-6)
  table[`${m}mol/L`] = u('concentration', 1e-6)
  table[`${m}M`] = u('concentration', 1e-6)
  table[`${m}g/L`] = u('mass-concentration', 1e-6)
}

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
