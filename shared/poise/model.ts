/**
 * The compiled model: the contract between the Poise compiler (this folder)
 * and the equilibrium solver (server/solver). It is plain data (JSON-safe) so
 * it can be stored with a run, sent to a worker thread and diffed.
 *
 * Units everywhere in the model: concentrations in mol/L, pressures in atm,
 * temperatures in degrees Celsius, enthalpies in kJ/mol, constants as log10.
 */

import type { IonSizeSource } from './ionSize'

export type Phase = 'aq' | 's' | 'g'

export type ComponentMode = 'total' | 'free' | 'pH' | 'pressure' | 'balance' | 'excess'

export type ActivityModelName = 'ideal' | 'davies' | 'debye-huckel'

export interface ModelComponent {
  /** Name in caret form, as results show it: `Cu^2+`, `CO2(g)`, `CaCO3(s)`. */
  name: string
  charge: number
  phase: Phase
  mode: ComponentMode
  /**
   * total: analytical concentration, mol/L (for H+ it may be negative: a proton deficit);
   * free: free concentration, mol/L; pH: the pH; pressure: partial pressure, atm;
   * balance and excess: 0.
   */
  value: number
  /** Element counts from the formula, e.g. { Cu: 1, N: 4, H: 12 }. */
  elements: Record<string, number>
  /** g/mol from IUPAC standard atomic weights. */
  molarMass: number
  /** 1-based source line of the `component` statement. */
  line: number
}

/** Formation data shared by species, solids and gases. */
export interface Formation {
  /** Stoichiometry over `model.components`, same order and length. */
  nu: number[]
  /** log10 of the formation constant from components, at `model.temperatureC`. */
  logK: number
  /** log10 of the formation constant at `model.refTemperatureC`. */
  logKRef: number
  /**
   * Standard enthalpy of the formation reaction from components, kJ/mol, or
   * null when a reaction in its chain gave no dH (then taken as 0).
   */
  dH: number | null
  /** 1-based source line of the defining reaction (or component statement). */
  line: number
  /**
   * How the reactions' constants reach this formation constant: logKRef =
   * Σ weight × model.reactions[reaction].logK over the reactions it was
   * chained through, so ∂logK/∂(log K of reaction r) = weight. Empty for a
   * component's free form; absent in models stored before uncertainties.
   */
  reactionWeights?: { reaction: number; weight: number }[]
}

/** An aqueous species; every component's free form is one too (nu = unit vector, logK = 0). */
export interface ModelSpecies extends Formation {
  name: string
  charge: number
  elements: Record<string, number>
  /** Index into model.components when this species is a component's free form. */
  componentIndex: number | null
  /**
   * Charged species only: the ion-size parameter å of the extended
   * Debye–Hückel equation, in ångström, and where it came from (`ion-size` in
   * the file, the built-in table of shared/poise/ionSize.ts, or a guess by
   * charge). Absent in models stored before ion sizes were part of the model:
   * the solver then takes the built-in default.
   */
  ionSize?: number
  ionSizeSource?: IonSizeSource
}

/**
 * A solid. Its formation from components is `solid = Σ nu_j component_j`, so
 * its saturation index is SI = logK + Σ nu_j log10 a_j (zero at saturation).
 * For a dissolution reaction with pKsp P, logK = P.
 */
export interface ModelSolid extends Formation {
  name: string
  elements: Record<string, number>
  /** `solid X(s) suppressed`: never precipitates, SI still reported. */
  suppressed: boolean
}

/** A gas that is not a component: log10 p(atm) = logK + Σ nu_j log10 a_j, reported only. */
export interface ModelGas extends Formation {
  name: string
  elements: Record<string, number>
}

/** The kinds of an equilibrium constant a reaction line may give (the lexer, completion and the checker read this list). */
export const CONSTANT_KINDS = ['logK', 'K', 'pK', 'logbeta', 'beta', 'pKa', 'Ka', 'pKsp', 'Ksp', 'logKsp', 'pKw', 'logKH'] as const
export type ConstantKind = (typeof CONSTANT_KINDS)[number]
/** Kinds read only right after the last species of a reaction (elsewhere `K`, `Ka`, `Ksp` could be formulas). */
export const KINDS_AFTER_FORMULA_ONLY: ReadonlySet<ConstantKind> = new Set(['K', 'Ka', 'Ksp'])

/** A reaction as the file wrote it (for reports and model diffs). */
export interface ModelReaction {
  /** Normalised text in caret form, e.g. `Cu^2+ + 2 NH3 <=> Cu(NH3)2^2+`. */
  equation: string
  kind: ConstantKind
  /** The number as written after the kind. */
  value: number
  /** log10 K of the reaction as written, at the reference temperature. */
  logK: number
  dH: number | null
  /** The citation: the `cite "..."` text, or the full text of `source KEY`; null when none. */
  cite: string | null
  /**
   * `fit` was written after the constant: it is to be fitted to measured data.
   * Always false for a reaction that came from a library through `use` (a
   * library's marks are its own; write the reaction in the file to fit it).
   */
  fit: boolean
  /** The ± as written (`pKa 4.70 ± 0.05`), in the kind's own units; null when none. */
  uncertainty: number | null
  /**
   * Standard uncertainty of log10 K of the reaction as written: the same
   * number as `uncertainty` for log and p kinds, σ/(K·ln 10) for K, Ka, beta
   * and Ksp; null when no ± was written.
   */
  logKUncertainty: number | null
  /** The species this reaction defines. */
  defines: string
  /** Library name when the reaction came from `use`; null for the file itself. */
  library: string | null
  line: number
}

export type SweepVariable = 'pH' | 'total' | 'temperature' | 'pressure'

export interface ModelSweep {
  variable: SweepVariable
  /** Component name for `total` and `pressure` sweeps, else null. */
  component: string | null
  /** The points, in order: pH units; mol/L; degrees C; atm. */
  values: number[]
  log: boolean
  line: number
}

/**
 * `map X-AXIS by Y-AXIS`: a grid of solves, each axis a ModelSweep (the
 * first axis, x, runs along a row; the second, y, from row to row). Cell
 * (row i, column j) is the model with y at y.values[i] and x at x.values[j].
 */
export interface ModelMap {
  x: ModelSweep
  y: ModelSweep
  /** 1-based line of the `map` statement. */
  line: number
}

/**
 * `limit dissolved X N UNIT`: a ceiling on a dissolved total, read along the
 * sweep. The quantity in mol/L at an answer is Σ_j weights[j] ×
 * components[j].dissolved: for an element, how many of its atoms each
 * component holds; for a component, 1 for it and 0 for the others.
 */
export interface ModelLimit {
  /** In words, e.g. `dissolved Ni` (the element, or the component without its charge). */
  quantity: string
  /** As written, in caret form: `Ni` or `Ni^2+`. */
  target: string
  targetKind: 'element' | 'component'
  /** The number and unit as written (`1`, `mg/L`). */
  value: number
  unit: string
  /** The limit in mol/L: of atoms of the element, or of the component's formula units. */
  molPerLitre: number
  /** Over `model.components`, same order and length. */
  weights: number[]
  line: number
}

/** One `titrant F N UNIT` line. */
export interface ModelTitrant {
  /** Species in caret form (`Na^+`… as results show it). */
  species: string
  /** mol/L in the titrant. */
  concentration: number
  line: number
}

/**
 * `sample volume`, `titrant` and `titrate`: the sample (the model's own
 * totals, in `sampleVolumeL`) receives the titrant; at an added volume v
 * every `total` component is (V0·T0 + v·Tt)/(V0 + v).
 */
export interface ModelTitration {
  /** Volume of the sample, L. */
  sampleVolumeL: number
  titrant: ModelTitrant[]
  /** What one litre of titrant brings to each component's total, mol/L, over `model.components` (same order and length). */
  titrantTotals: number[]
  /** Added volumes of the curve, mL (as the answer reports them); null for `titrate to pH`. */
  values: number[] | null
  /** `titrate to pH X`: the target; null for a curve. */
  targetPH: number | null
  /** The volume unit the file wrote (mL, L, uL, µL), for showing a dose in it. */
  unit: string
  /** 1-based line of the `titrate` statement. */
  line: number
}

/** `uncertainty draws N [seed S]`: how the Monte Carlo of a sweep or titration draws the constants. */
export interface ModelMonteCarlo {
  draws: number
  /** The generator's seed (1 when the file gives none): the same seed gives the same bands. */
  seed: number
  line: number
}

export type { IonSizeSource }

export interface Model {
  title: string
  temperatureC: number
  /** Temperature the constants are tabulated at (25 C). */
  refTemperatureC: number
  activity: ActivityModelName
  /** `ionic-strength N UNIT`, mol/L; null when computed from the species. */
  fixedIonicStrength: number | null
  components: ModelComponent[]
  species: ModelSpecies[]
  solids: ModelSolid[]
  gases: ModelGas[]
  reactions: ModelReaction[]
  sweep: ModelSweep | null
  /** The titration the file declares; absent when none (and in models stored before titrations existed). */
  titration?: ModelTitration
  /** The map the file declares; absent when none (and in models stored before maps existed). */
  map?: ModelMap
  /** `uncertainty draws N`: present only when the file asks for a Monte Carlo. */
  monteCarlo?: ModelMonteCarlo
  /** `limit` statements of the file; absent when it has none (and in models stored before limits existed). */
  limits?: ModelLimit[]
  /** `source KEY "text"` entries, the file's and its libraries'. */
  sources: Record<string, string>
  /** Libraries resolved through `use`, with the revision actually used. */
  libraries: { name: string; revision: number }[]
}
