/**
 * The solver's answer (the Result JSON). Concentrations in mol/L, amounts of
 * solid in mol per litre of solution, pressures in atm.
 */

export interface SpeciesResult {
  name: string
  charge: number
  concentration: number
  log10: number
  activity: number
  gamma: number
}

export interface SolidResult {
  name: string
  present: boolean
  /** mol/L precipitated (0 when absent); for an `excess` solid component, mol/L dissolved. */
  amount: number
  saturationIndex: number
  suppressed?: boolean
}

export interface GasResult {
  name: string
  /** Equilibrium partial pressure, atm. */
  pressure: number
  log10: number
}

export interface ComponentResult {
  name: string
  mode: 'total' | 'free' | 'pH' | 'pressure' | 'balance' | 'excess'
  /** Analytical total in solution plus solids, mol/L (computed for every mode). */
  total: number
  /** Free concentration (or activity for fixed-activity modes), mol/L. */
  free: number
  /** Total dissolved (aqueous species only), mol/L. */
  dissolved?: number
}

export interface Result {
  converged: boolean
  iterations: number
  temperatureC: number
  pH: number
  ionicStrength: number
  species: SpeciesResult[]
  solids: SolidResult[]
  gases?: GasResult[]
  components: ComponentResult[]
  residuals: { maxScaled: number; equations?: { name: string; scaled: number }[] }
  /** Present when converged is false: what did not close and why, in words. */
  reason?: string
  /** Notes the solver adds (e.g. ionic strength beyond the activity model's range). */
  warnings?: string[]
}

export interface SweepResult {
  variable: 'pH' | 'total' | 'temperature' | 'pressure'
  component: string | null
  values: number[]
  points: Result[]
}
