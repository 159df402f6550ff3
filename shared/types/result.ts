/**
 * The solver's answer (the Result JSON). Concentrations in mol/L, amounts of
 * solid in mol per litre of solution, pressures in atm.
 *
 * No number in it is ever NaN, Infinity or a made-up stand-in: a quantity
 * that does not exist (the log10 of a species whose component has a total of
 * 0, the saturation index of a solid made of such a component) is `null`,
 * and the entry's `none` field says why.
 */

/**
 * The ± of one answer from the uncertainties of the model's constants (the
 * `± S` written after them; see Result.uncertainty for how it was found).
 */
export interface AnswerUncertainty {
  /**
   * Standard uncertainty in the quantity's own units: log10 units for log10 c,
   * pH, a saturation index and log10 p; mol/L for a dissolved total. For a
   * Monte Carlo, half the 2.5–97.5 % range divided by 1.96.
   */
  sigma: number
  /**
   * Linear propagation: the constant that contributes most to σ², as its
   * reaction is written in the model (`ModelReaction.equation`), with its
   * share of σ² (0–1); null when σ is 0.
   */
  main?: { reaction: string; share: number } | null
  /** Monte Carlo: the median and the 2.5 % and 97.5 % quantiles over the draws. */
  median?: number
  low?: number
  high?: number
}

/** How the ± of an answer were found; present only when some constant carries a ±. */
export interface UncertaintySummary {
  /** `linear`: first-order propagation through the solver's sensitivities (one solve); `monte-carlo`: constants drawn and solved again (sweeps, titrations). */
  method: 'linear' | 'monte-carlo'
  /** The constants that carry a ±: the reaction as written, its kind and σ of its log10 K. */
  constants: { reaction: string; kind: string; logKUncertainty: number }[]
  /** Monte Carlo: draws made, the seed of the generator, and draws whose solve did not converge (left out of the bands). */
  samples?: number
  seed?: number
  failed?: number
  /** Monte Carlo: set when fewer draws were made than asked (the time budget ran out), saying how many. */
  note?: string
}

export interface SpeciesResult {
  name: string
  charge: number
  concentration: number
  /** log10 of the concentration; null when there is none (see `none`). */
  log10: number | null
  /** ± of log10 (log10 units); only when some constant carries a ± and log10 is not null. */
  log10Uncertainty?: AnswerUncertainty
  activity: number
  gamma: number
  /** Why a value above is null (e.g. a component of the species has a total of 0). */
  none?: string
}

export interface SolidResult {
  name: string
  present: boolean
  /**
   * mol/L precipitated (0 when absent); for an `excess` solid component,
   * mol/L dissolved. Kept for readers of older results: `precipitated` and
   * `dissolved` below say which of the two it is.
   */
  amount: number
  /** mol/L of this solid precipitated (0 when absent); absent on an `excess` component's entry. */
  precipitated?: number
  /** For an `excess` solid component only: mol/L of it dissolved. */
  dissolved?: number
  /** log10 of the saturation ratio; null when it has none (see `none`). */
  saturationIndex: number | null
  /** ± of the saturation index; only when some constant carries a ± (0 for a solid present at equilibrium). */
  saturationIndexUncertainty?: AnswerUncertainty
  suppressed?: boolean
  /** Why a value above is null. */
  none?: string
}

export interface GasResult {
  name: string
  /** Equilibrium partial pressure, atm. */
  pressure: number
  /** log10 of the pressure; null when there is none (see `none`). */
  log10: number | null
  /** ± of log10 of the pressure; only when some constant carries a ±. */
  log10Uncertainty?: AnswerUncertainty
  /** Why a value above is null. */
  none?: string
}

export interface ComponentResult {
  name: string
  mode: 'total' | 'free' | 'pH' | 'pressure' | 'balance' | 'excess'
  /** Analytical total in solution plus solids, mol/L (computed for every mode). */
  total: number
  /**
   * Free concentration, or activity for the fixed-activity modes (pH,
   * pressure, excess), mol/L. Kept for readers of older results:
   * `freeConcentration` and `freeActivity` give each on its own.
   */
  free: number
  /** Concentration of the component's free form, mol/L; absent when it has no aqueous free form. */
  freeConcentration?: number
  /** Activity of the component (its free form's concentration times γ; 1 for an excess solid). */
  freeActivity?: number
  /** Total dissolved (aqueous species only), mol/L. */
  dissolved?: number
  /** ± of `dissolved`, mol/L; only when some constant carries a ±. */
  dissolvedUncertainty?: AnswerUncertainty
}

/**
 * The hand method beside the exact answer (definitions in
 * shared/results/shortcut.ts): fractions of species at the answer's pH,
 * activities taken as concentrations, ligands in excess; factor = estimate / exact.
 */
export interface Shortcut {
  pH: number
  components: { name: string; alphaFree: number; freeEstimate: number; freeExact: number; factor: number }[]
  solids: { name: string; solubilityEstimate: number; solubilityExact: number; factor: number }[]
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
  /** The hand method's estimate beside this answer; absent when the answer did not converge. */
  shortcut?: Shortcut
  /**
   * Buffer capacity β = dC(base)/dpH, mol/L per pH unit: the strong
   * monovalent base (added without dilution) that raises the pH by one unit
   * at this composition, from the model's own equations (their sensitivity
   * at the answer). Set on single solves and titration points; null when H+
   * is held or the pH does not move with the base (a solid fixes it).
   */
  bufferCapacity?: number | null
  /** ± of the pH; only when some constant carries a ± and H+ is solved for. */
  pHUncertainty?: AnswerUncertainty
  /** How the ± of this answer were found; absent when no constant carries a ±. */
  uncertainty?: UncertaintySummary
}

/**
 * Where along a sweep a `limit dissolved X N UNIT` holds: the ranges of the
 * swept variable (its own units: pH, mol/L, °C, atm) over which the quantity
 * is at or below the limit. An end inside the sweep is located by exact
 * solves (bisection) to better than 0.001 of the variable, on the side where
 * the limit holds; an end at the sweep's first or last value is that value.
 */
export interface LimitWindow {
  /** In words: `dissolved Ni`. */
  quantity: string
  /** The limit as written: `1`, `mg/L`. */
  value: number
  unit: string
  /** [from, to] with from ≤ to, in increasing order; empty when the limit holds nowhere. */
  ranges: [number, number][]
  /** Set when an end could not be located exactly (a solve failed): what was done instead. */
  note?: string
}

export interface SweepResult {
  /** `volume`: a titration curve read as a sweep (added titrant, mL; titrationAsSweep in shared/results/titration.ts). */
  variable: 'pH' | 'total' | 'temperature' | 'pressure' | 'volume'
  component: string | null
  values: number[]
  points: Result[]
  /** One entry per `limit` statement of the model, in file order; absent when it has none. */
  limits?: LimitWindow[]
}

/** An end point of a titration curve: where |dpH/dv| peaks, located by exact solves. */
export interface EquivalencePoint {
  /** Added volume, mL. */
  volume: number
  pH: number
}

/** `titrate from A to B …`: the curve. */
export interface TitrationCurveResult {
  kind: 'titration'
  /** Volume of the sample, L. */
  sampleVolumeL: number
  /** The volume unit the file wrote, for showing volumes in it (values stay in mL). */
  unit: string
  /** Added volumes, mL. */
  values: number[]
  /** One Result per added volume, each with its bufferCapacity. */
  points: Result[]
  /** dpH/dv at each point, pH units per mL, from the model's sensitivity; null where the point did not converge. */
  derivative: (number | null)[]
  equivalencePoints: EquivalencePoint[]
  /** One entry per `limit` statement, in file order, ranges in added mL; absent when the file has none. */
  limits?: LimitWindow[]
}

/** `titrate to pH X`: the dose. */
export interface TitrationDoseResult {
  kind: 'titration'
  sampleVolumeL: number
  unit: string
  target: { pH: number }
  /** Added volume that reaches the target, mL; null when it cannot be reached (see reason). */
  volume: number | null
  /** The solution at that volume; null when the target cannot be reached. */
  point: Result | null
  /** Why there is no volume: "not reachable with this titrant: …", or a solve that failed. */
  reason?: string
}

export type TitrationResult = TitrationCurveResult | TitrationDoseResult

/** One axis of a map: the model's axis (ModelSweep without its line). */
export interface MapAxis {
  variable: 'pH' | 'total' | 'temperature' | 'pressure'
  /** Component name for `total` and `pressure`, else null. */
  component: string | null
  /** pH units; mol/L; °C; atm. */
  values: number[]
  log: boolean
}

/**
 * A map with every cell a Result: what `solve --json` prints for a map.
 * `points[i][j]` is the cell at y.values[i] and x.values[j].
 */
export interface MapResult {
  x: MapAxis
  y: MapAxis
  /** One row per y value, each with one Result per x value. */
  points: Result[][]
}

/**
 * Points by columns (shared/results/sweep-columns.ts reads and writes them):
 * each shape of point once as a template (its numbers replaced by a
 * marker), and each number of that shape one column over the points that
 * have it. In JSON the columns are arrays of numbers (null where the number
 * was NaN).
 */
export interface PointColumns {
  templates: unknown[]
  /** For each point, the index of its template. */
  templateOf: ArrayLike<number>
  /** For each point, its row among the points of its template. */
  rowOf: ArrayLike<number>
  /** For each template, its numbers by column: slot s of row r is columns[t][s * rows[t] + r]. */
  columns: ArrayLike<number>[]
  /** For each template, how many points have it. */
  rows: number[]
}

/**
 * A map as the API answers and stores it: the cells by columns, row after
 * row (cell k is row ⌊k / x.values.length⌋, column k mod x.values.length).
 * `mapCell` (shared/results/map-columns.ts) makes the Result of one cell.
 */
export interface MapAnswer {
  format: 'map-columns'
  x: MapAxis
  y: MapAxis
  cells: PointColumns
  /** Cells solved before the map ended (all of them unless it was cancelled). */
  cellsDone: number
  /** Cells that did not converge, those not reached after a cancel included. */
  failedCells: number
  /** True when the map was cancelled: cells after `cellsDone` are marked not solved. */
  cancelled: boolean
}

/** What a run answers: one solve, a sweep, a titration or a map (stored with each run). */
export type AnswerKind = 'single' | 'sweep' | 'titration' | 'map'

/** Points of a titration answer that did not converge; a dose that is "not reachable" is an answer, not a failure. */
export function failedTitrationPoints(t: TitrationResult): number {
  if ('points' in t) return t.points.filter((p) => !p.converged).length
  return t.volume === null && !/not reachable with this titrant/.test(t.reason ?? '') ? 1 : 0
}

/** What a solve answers, as the API sends it and a run stores it: by AnswerKind, in that order. */
export type Answer = Result | SweepResult | TitrationResult | MapAnswer

export function isMapAnswer(r: unknown): r is MapAnswer {
  return typeof r === 'object' && r !== null && (r as { format?: unknown }).format === 'map-columns'
}

export function isTitrationResult(r: unknown): r is TitrationResult {
  return typeof r === 'object' && r !== null && (r as { kind?: unknown }).kind === 'titration'
}
