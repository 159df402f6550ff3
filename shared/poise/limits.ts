/**
 * Every limit on a number Poise accepts, in one module: the checker
 * (shared/poise), the server's request limits (server/utils/solve-limits.ts)
 * and the language reference (grammar/README.md, whose limits table is
 * generated from `limitsTable()` by scripts/grammar-diagrams.ts and checked by
 * a unit test) all read them from here.
 *
 * A quantity has a hard range (outside it the file has an error: the number
 * is impossible for a solution in liquid water, or beyond what the solver's
 * arithmetic can carry) and may have a usual range (outside it a warning: the
 * number is possible but rarely meant). Every message states the range.
 */
import type { Reporter } from './reporter'

export interface Bound {
  /** Lower end; `open` excludes it (a value must be above it). */
  min: number
  minOpen?: boolean
  max: number
  maxOpen?: boolean
}

export interface QuantityLimit {
  /** How messages name the quantity: "the pH", "the temperature". */
  label: string
  /** The model unit shown after numbers in messages ('' for pH). */
  unit: string
  hard: Bound
  /** Why the hard range is what it is (said in the error). */
  hardWhy: string
  usual?: Bound
  /** Why values outside the usual range deserve a second look (said in the warning). */
  usualWhy?: string
}

/** Avogadro constant, 1/mol (exact in the 2019 SI). */
const AVOGADRO = 6.02214076e23

export const LIMITS = {
  // pH: the activity scale is defined and measured in water from about 0 to 14;
  // strong acids and bases reach a little beyond (common practice).
  pH: {
    label: 'the pH', unit: '',
    hard: { min: -2, max: 16 },
    hardWhy: 'beyond it no activity scale of pH in water means anything',
    usual: { min: 0, max: 14 },
    usualWhy: 'pH in water is measured from 0 to 14; outside it the activity models of Poise are far outside their range',
  },
  // Poise takes the solution at 1 atm total pressure; liquid water exists there
  // from its melting point to its boiling point (0 and 100 °C, common practice).
  temperature: {
    label: 'the temperature', unit: ' °C',
    hard: { min: 0, max: 100 },
    hardWhy: 'Poise models a solution in liquid water at 1 atm, and water is liquid at 1 atm only from 0 to 100 °C',
  },
  // Pure water is 55.5 mol/L (1000 g/L ÷ 18.015 g/mol): no dissolved substance
  // can be more concentrated in water than the solvent is in itself. Above a few
  // mol/L few salts still dissolve and no activity model of Poise holds (common
  // practice). Below 1/N_A = 1.66e-24 mol/L a litre holds less than one particle.
  // A total of exactly 0 is always allowed (the component is absent).
  concentration: {
    label: 'the concentration', unit: ' mol/L',
    hard: { min: 0, max: 55 },
    hardWhy: 'pure water itself is only 55.5 mol/L, so no solution in water can hold more',
    usual: { min: 1 / AVOGADRO, max: 5 },
    usualWhy: 'below it a litre holds less than one particle (Avogadro constant 6.022e23 /mol); above it few substances dissolve and no activity model of Poise describes the solution',
  },
  ionicStrength: {
    label: 'the ionic strength', unit: ' mol/L',
    hard: { min: 0, max: 55 },
    hardWhy: 'pure water itself is only 55.5 mol/L, so no solution in water reaches it',
    usual: { min: 0, max: 5 },
    usualWhy: 'no activity model of Poise describes a solution that concentrated',
  },
  // Ideal gas and Henry's law are assumed; far from true at a hundred atm,
  // where many gases condense (CO2 at about 64 atm at 25 °C, from memory).
  pressure: {
    label: 'the partial pressure', unit: ' atm',
    hard: { min: 0, minOpen: true, max: 100 },
    hardWhy: 'Poise takes gases as ideal and obeying Henry’s law, which fails long before that (CO2 condenses at about 64 atm at 25 °C)',
    usual: { min: 0, max: 1 },
    usualWhy: 'the solution is taken at 1 atm total, so a higher partial pressure needs a closed, pressurised vessel',
  },
  // The largest constants tabulated for reactions in water are near 10^±55
  // (sulfides of mercury and silver, from memory); a log K beyond ±150 is a typo,
  // and chained constants of that size leave the solver's floating-point range.
  logK: {
    label: 'log K', unit: '',
    hard: { min: -150, max: 150 },
    hardWhy: 'no equilibrium constant in water comes near it, and the solver cannot carry such numbers through a chain of reactions',
    usual: { min: -60, max: 60 },
    usualWhy: 'the largest constants tabulated for reactions in water are near 10^±55: check the sign and the kind (pK or log K)',
  },
  // Reaction enthalpies in water are tens to a few hundred kJ/mol (common practice).
  // The standard uncertainty of a log K (a `±` after a constant, converted to
  // log10 units). Tabulated constants are rarely known to better than 0.01 or
  // worse than a few tenths (common practice); beyond a few log units the
  // linear propagation and the Monte Carlo bands describe nothing useful.
  logKUncertainty: {
    label: 'the uncertainty of log K', unit: '',
    hard: { min: 0, minOpen: true, max: 20 },
    hardWhy: 'an uncertainty of more than 20 log units says the constant is not known at all: leave the ± out, or check the kind (for K, Ka, beta and Ksp the ± is in K, not in log K)',
    usual: { min: 0, max: 3 },
    usualWhy: 'it spans thousands in K, where the linear ± of the answers means little (the Monte Carlo bands of a sweep still hold); check the kind (for K, Ka, beta and Ksp the ± is in K, not in log K)',
  },
  enthalpy: {
    label: 'the reaction enthalpy', unit: ' kJ/mol',
    hard: { min: -1000, max: 1000 },
    hardWhy: 'reactions in water have enthalpies of tens to a few hundred kJ/mol: check the unit',
  },
  coefficient: {
    label: 'the coefficient', unit: '',
    hard: { min: 0.01, max: 1000 },
    hardWhy: 'reactions are written with small whole numbers or simple fractions',
  },
  // Ion-size parameters of the extended Debye–Hückel equation span about
  // 2.5 to 11 Å in Kielland's (1937) table (from memory).
  ionSize: {
    label: 'the ion size', unit: ' Å',
    hard: { min: 0, minOpen: true, max: 20 },
    hardWhy: 'an ion-size parameter is the diameter of a hydrated ion, a few ångström',
    usual: { min: 2, max: 12 },
    usualWhy: 'tabulated ion-size parameters span about 2.5 to 11 Å',
  },
  // Volumes of a titration: a sample of a few microlitres at the bench up to a
  // plant's neutralisation tank (1000 m³ = 1e6 L); beyond, a volume is a typo
  // of its unit (common practice).
  volume: {
    label: 'the volume', unit: ' L',
    hard: { min: 0, max: 1e6 },
    hardWhy: 'a titrated sample or a dose is at most a large tank (1000 m³): check the unit',
  },
} as const satisfies Record<string, QuantityLimit>

export type LimitName = keyof typeof LIMITS

/**
 * Every number written in Poise is 0 or between these in size: what double
 * precision carries (beyond the largest it reads as Infinity, below the
 * smallest normal number it loses digits or reads as 0). Each quantity then
 * has its own, narrower range (LIMITS).
 */
export const NUMBER_MAX = Number.MAX_VALUE
export const NUMBER_MIN = 2.2250738585072014e-308

/**
 * A non-zero concentration closer to 0 than this is refused: below it the
 * free forms and the balance sums fall into subnormal doubles, which carry
 * too few digits to close a balance to 1e-10 (server/solver/problem.ts reads
 * the same constant). Give 0 to leave a component out.
 */
export const MIN_NONZERO_TOTAL = 1e-300

/**
 * How big one system may be. One object, read by the checker (sweep, map and
 * titration points) and by the server's request limits (`SOLVE_LIMITS.size`
 * in server/utils/solve-limits.ts is this very object).
 */
export const SIZE_LIMITS = {
  /** Largest Poise source accepted, in characters. */
  maxSourceChars: 200_000,
  /** At most this many points in one sweep or titration, and on each axis of a map. */
  maxSweepPoints: 5000,
  /** At most this many cells (points of the first axis × points of the second) in one `map`. */
  maxMapCells: 40_000,
  /**
   * Set from the benchmark's scaling table (bench/README.md), not a round
   * number: since the sparse LU a sweep point costs about in proportion to
   * the species, and the largest system measured, 256 components and 765
   * species, took ~25 ms a point on the benchmark's 2-core machine under a
   * load of 18 — one solve well under a second, a 500-point sweep inside the
   * 20 s solve budget, its points' JSON ~85 MB. 800 keeps a system of that
   * size, with a few species to spare, inside those figures.
   */
  maxSpecies: 800,
  maxSolids: 60,
} as const
/** A data set for fitting (shared/fit/dataset.ts) has at most this many rows of data: each is an exact solve at every step of a fit. */
export const MAX_DATASET_ROWS = 500
/** …and at most this many columns (the study variable and the measurements). */
export const MAX_DATASET_COLUMNS = 16
/**
 * `uncertainty draws N`: a Monte Carlo needs some tens of draws before its
 * 2.5 and 97.5 % quantiles mean anything (with 40 draws they are the 1st and
 * 39th values; common practice), and past a few thousand the bands stop
 * moving while the wait grows.
 */
export const MIN_MONTE_CARLO_DRAWS = 40
export const MAX_MONTE_CARLO_DRAWS = 2000
/**
 * At most draws × points solves in one Monte Carlo: it runs with the sweep or
 * titration in one request (the solver pool's time budget), so a run stays
 * within seconds; the checker and the solver read it.
 */
export const MAX_MONTE_CARLO_SOLVES = 40_000
/** Largest seed of the generator (a 32-bit signed integer, what pure-rand seeds with). */
export const MAX_MONTE_CARLO_SEED = 2 ** 31 - 1

/** At most this many atoms of one element in a formula. */
export const MAX_ATOM_COUNT = 1000
/** Largest charge of a species. */
export const MAX_CHARGE = 20

/**
 * A number for a message: never NaN or Infinity, at most 6 significant
 * digits, plain notation between 1e-4 and 1e6.
 */
export function formatNumber(x: number): string {
  if (Number.isNaN(x)) return 'not a number'
  if (!Number.isFinite(x)) return x > 0 ? 'too large a number' : 'too large a negative number'
  if (x === 0) return '0'
  const a = Math.abs(x)
  if (a >= 1e-4 && a < 1e6) return String(Number(x.toPrecision(6)))
  const [m, e] = x.toExponential(5).split('e')
  return `${String(Number(m))}e${Number(e)}`
}

/** The hard or usual range in words, as messages and the reference say it: "from -2 to 16", "above 0 and up to 100 atm". */
export function rangeText(name: LimitName, which: 'hard' | 'usual' = 'hard'): string {
  const l: QuantityLimit = LIMITS[name]
  const b = which === 'hard' ? l.hard : l.usual!
  const lower = b.minOpen ? `above ${formatNumber(b.min)} and` : `from ${formatNumber(b.min)}`
  const upper = b.maxOpen ? `below ${formatNumber(b.max)}` : `${b.minOpen ? 'up to' : 'to'} ${formatNumber(b.max)}`
  return `${lower} ${upper}${l.unit}`
}

function inside(x: number, b: Bound): boolean {
  // A sliver of tolerance for unit conversions (373.15 K is 100 °C to rounding).
  const slack = (v: number) => 1e-9 * Math.abs(v)
  const lowOk = b.minOpen ? x > b.min : x >= b.min - slack(b.min)
  const highOk = b.maxOpen ? x < b.max : x <= b.max + slack(b.max)
  return lowOk && highOk
}

export interface RangeProblem { severity: 'error' | 'warning'; message: string }

/**
 * What is wrong with value as the named quantity: an error outside the hard
 * range (or when not finite), a warning outside the usual range, else null.
 * `magnitude` checks |value| (an H+ total may be negative: a proton deficit).
 */
export function rangeProblem(name: LimitName, value: number, options: { magnitude?: boolean; what?: string } = {}): RangeProblem | null {
  const l: QuantityLimit = LIMITS[name]
  const what = options.what ?? l.label
  const shown = `${formatNumber(value)}${l.unit}`
  if (!Number.isFinite(value)) return { severity: 'error', message: `${what} must be a finite number, ${rangeText(name)}` }
  const v = options.magnitude ? Math.abs(value) : value
  // Zero is an absent component, never "less than one particle".
  if (v === 0 && name === 'concentration') return null
  if (name === 'concentration' && v > 0 && v < MIN_NONZERO_TOTAL) {
    return { severity: 'error', message: `${what} is ${shown}, closer to 0 than ${formatNumber(MIN_NONZERO_TOTAL)}${l.unit}, beyond what the solver's arithmetic can resolve: give 0 to leave it out` }
  }
  if (!inside(v, l.hard)) {
    return { severity: 'error', message: `${what} is ${shown}, outside the range Poise accepts (${options.magnitude ? 'in size ' : ''}${rangeText(name)}): ${l.hardWhy}` }
  }
  if (l.usual && !inside(v, l.usual)) {
    return { severity: 'warning', message: `${what} is ${shown}, outside the usual range (${options.magnitude ? 'in size ' : ''}${rangeText(name, 'usual')}): ${l.usualWhy}` }
  }
  return null
}

/** Reports a range problem (P083 error or W106 warning); false when it is an error. */
export function checkRange(report: Reporter, name: LimitName, value: number, at: { from: number; to: number }, options: { magnitude?: boolean; what?: string } = {}): boolean {
  const p = rangeProblem(name, value, options)
  if (!p) return true
  if (p.severity === 'error') report.error('P083', p.message, at)
  else report.warning('W106', p.message, at)
  return p.severity !== 'error'
}

/** The limits as a Markdown table, for grammar/README.md. */
export function limitsTable(): string {
  const rows = (Object.keys(LIMITS) as LimitName[]).map((name) => {
    const l: QuantityLimit = LIMITS[name]
    return `| \`${name}\` | ${rangeText(name)} (${l.hardWhy}) | ${l.usual ? `${rangeText(name, 'usual')} (${l.usualWhy})` : '—'} |`
  })
  return [
    '| quantity | error outside | warning outside |',
    '| --- | --- | --- |',
    ...rows,
    `| a non-zero concentration | ${formatNumber(MIN_NONZERO_TOTAL)} mol/L or more in size (the solver cannot resolve less; write 0 to leave a component out) | — |`,
    `| any number written | 0, or ${formatNumber(NUMBER_MIN)} to ${formatNumber(NUMBER_MAX)} in size | — |`,
    `| sweep points | 2 to ${SIZE_LIMITS.maxSweepPoints} | — |`,
    `| titration points | 2 to ${SIZE_LIMITS.maxSweepPoints} | — |`,
    `| map cells (points of the first axis × points of the second) | 4 to ${SIZE_LIMITS.maxMapCells} (each axis 2 to ${SIZE_LIMITS.maxSweepPoints}) | — |`,
    `| \`uncertainty draws\` | ${MIN_MONTE_CARLO_DRAWS} to ${MAX_MONTE_CARLO_DRAWS}, and draws × points of the sweep or titration at most ${MAX_MONTE_CARLO_SOLVES} | — |`,
    `| \`seed\` | a whole number from 0 to ${MAX_MONTE_CARLO_SEED} | — |`,
    `| atoms of one element in a formula | 1 to ${MAX_ATOM_COUNT} | — |`,
    `| charge of a species | −${MAX_CHARGE} to +${MAX_CHARGE} | — |`,
  ].join('\n')
}
