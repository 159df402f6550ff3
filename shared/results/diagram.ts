/**
 * Sweep results → plot-ready series for the three diagrams the trade reads:
 * distribution (fraction of a component's dissolved total in each species),
 * log concentration of every species, and solubility (the component's
 * dissolved total). Pure data, no plotting library: the diagram component
 * draws what this returns, and the tests check it.
 *
 * A point whose solve failed is a gap (NaN), never a zero: a zero would draw
 * a plausible-looking curve through a value nobody computed.
 */

import type { AnswerUncertainty, LimitWindow, Result, SweepResult } from '../types/result'
import type { ModelLimit } from '../poise/model'
import { dissolvedTotal, speciesShares, type StoichiometryModel } from './share'
import { typesetFormula } from './typeset'
import { dissolvedLabel } from './names'
import { MOLAR_SCALE, type UnitScale } from './units'

export type DiagramKind = 'distribution' | 'logConcentration' | 'solubility' | 'shortcut'

/** The kinds in the order the segmented control shows them, with their words. */
export const DIAGRAM_KINDS: { kind: DiagramKind; label: string }[] = [
  { kind: 'distribution', label: 'Distribution' },
  { kind: 'logConcentration', label: 'Log concentration' },
  { kind: 'solubility', label: 'Solubility' },
  { kind: 'shortcut', label: 'Shortcut factor' },
]

export function isDiagramKind(value: unknown): value is DiagramKind {
  return DIAGRAM_KINDS.some((k) => k.kind === value)
}

/**
 * The colour-blind-safe palette of Okabe & Ito (2008), "Color Universal
 * Design (CUD): how to make figures and presentations that are friendly to
 * colorblind people", in its published order; the four hues that fall below
 * a 3:1 contrast on white (WCAG 2.1, non-text contrast) are darkened, hue
 * kept, until they reach it. The original colour is in each comment.
 */
export const OKABE_ITO = [
  '#000000', // black
  '#BF8400', // orange (#E69F00)
  '#4897C4', // sky blue (#56B4E9)
  '#009E73', // bluish green
  '#9A922A', // yellow (#F0E442)
  '#0072B2', // blue
  '#D55E00', // vermillion
  '#C675A2', // reddish purple (#CC79A7)
] as const

/** Past eight species the colours repeat with a different dash, so no two series look alike. */
const DASHES = [null, '6 3', '2 2', '8 3 2 3'] as const

export interface SeriesStyle {
  color: string
  /** SVG stroke-dasharray, or null for a solid line. */
  dash: string | null
}

/** The style of the species at `index` in the model: the same in every diagram of the system. */
export function styleForIndex(index: number): SeriesStyle {
  const i = Math.max(0, index)
  return {
    color: OKABE_ITO[i % OKABE_ITO.length],
    dash: DASHES[Math.floor(i / OKABE_ITO.length) % DASHES.length],
  }
}

/** Log-concentration curves that stay below this (mol/L) are hidden unless asked for. */
export const DEFAULT_CONCENTRATION_FLOOR = 1e-14
/** Distribution curves whose fraction stays below this are hidden unless asked for. */
export const DISTRIBUTION_FLOOR = 1e-3
/** The floors a reader may choose: shares for the distribution, mol/L for log concentration. */
export const SHARE_FLOORS = [1e-3, 1e-2, 5e-2] as const
export const CONCENTRATION_FLOORS = [1e-14, 1e-10, 1e-6] as const

export interface DiagramSeries {
  /** Species name in caret form (or a description for the solubility lines). */
  key: string
  label: string
  color: string
  dash: string | null
  /**
   * Where the direct label sits: at the curve's highest point (distribution
   * and log-concentration curves peak in different places), or above the
   * right end / below the left end (the two solubility lines can coincide).
   */
  labelAt: 'peak' | 'end' | 'start'
  /** One value per sweep point; NaN where the point failed. */
  values: number[]
  /**
   * A sweep with `uncertainty draws N`: the Monte Carlo's median and
   * 2.5–97.5 % band at each point, in the series' own y units (NaN where a
   * point has none); absent when the answer has no bands for this series.
   */
  band?: { median: number[]; low: number[]; high: number[] }
}

export interface DiagramData {
  kind: DiagramKind
  xLabel: string
  yLabel: string
  /** True when the swept values span decades (a log sweep of a total or pressure). */
  xLog: boolean
  /** Fixed y range where the kind has one (fractions 0..1), else null. */
  yDomain: [number, number] | null
  x: number[]
  series: DiagramSeries[]
  /** Series left out because they stay below the floor (caret names). */
  hidden: string[]
  /** Indices of the points whose solve failed. */
  failedPoints: number[]
}

export interface DiagramOptions {
  kind: DiagramKind
  /** Component for distribution and solubility (ignored by log concentration). */
  component: string | null
  /** mol/L; default 1e-14. */
  floor?: number
  /** Distribution: a curve whose share stays below this is hidden; default DISTRIBUTION_FLOOR. */
  shareFloor?: number
  /** Show the series below the floor too. */
  showAll?: boolean
  /** The unit of the log-concentration and solubility axes (default mol/L); the floor stays in mol/L. */
  scale?: UnitScale
}

/** Axis label of the swept variable, in words with its unit. */
export function sweepAxisLabel(sweep: Pick<SweepResult, 'variable' | 'component'>): string {
  const name = sweep.component ? typesetFormula(sweep.component) : ''
  switch (sweep.variable) {
    case 'pH':
      return 'pH'
    case 'total':
      return `Total ${name} (mol/L)`
    case 'temperature':
      return 'Temperature (°C)'
    case 'pressure':
      return `Partial pressure of ${name} (atm)`
    case 'volume':
      return 'Added titrant (mL)'
  }
}

function spansDecades(values: number[]): boolean {
  if (values.length < 2 || values.some((v) => !(v > 0))) return false
  return Math.max(...values) / Math.min(...values) >= 100
}

function valueAt(point: Result | undefined, read: (r: Result) => number): number {
  if (!point || !point.converged) return Number.NaN
  const value = read(point)
  return Number.isFinite(value) ? value : Number.NaN
}

function maxFinite(values: number[]): number {
  let max = -Infinity
  for (const v of values) if (Number.isFinite(v) && v > max) max = v
  return max
}

function speciesIndex(model: StoichiometryModel, name: string): number {
  const i = model.species.findIndex((s) => s.name === name)
  return i < 0 ? model.species.length : i
}

/** Every species named in the sweep, model order first, so colours stay put between runs. */
function sweepSpecies(sweep: SweepResult, model: StoichiometryModel): string[] {
  const seen = new Set<string>()
  for (const point of sweep.points) for (const s of point.species) seen.add(s.name)
  return [...seen].sort((a, b) => speciesIndex(model, a) - speciesIndex(model, b))
}

function seriesFor(model: StoichiometryModel, name: string, values: number[]): DiagramSeries {
  return { key: name, label: typesetFormula(name), ...styleForIndex(speciesIndex(model, name)), labelAt: 'peak', values }
}

function concentrationOf(result: Result, name: string): number {
  return result.species.find((s) => s.name === name)?.concentration ?? Number.NaN
}

function distribution(sweep: SweepResult, model: StoichiometryModel, component: string): DiagramSeries[] {
  const j = model.components.findIndex((c) => c.name === component)
  if (j < 0) return []
  const holders = new Set(model.species.filter((s) => s.nu[j] > 0).map((s) => s.name))
  const shares = sweep.points.map((p) => (p.converged ? speciesShares(p, model, component) : null))
  return sweepSpecies(sweep, model)
    .filter((name) => holders.has(name))
    .map((name) =>
      seriesFor(
        model,
        name,
        sweep.points.map((p, k) => {
          const i = p.species.findIndex((s) => s.name === name)
          const share = shares[k]?.[i]
          return share !== undefined && Number.isFinite(share) ? share : Number.NaN
        }),
      ),
    )
}

/** The Monte Carlo band of a quantity along the sweep (`read` gives its uncertainty at a point), through `y`; undefined when no point has one. */
export function bandAlong(sweep: SweepResult, read: (r: Result) => AnswerUncertainty | undefined, y: (v: number) => number = (v) => v): DiagramSeries['band'] {
  const at = sweep.points.map((p) => (p.converged ? read(p) : undefined))
  if (!at.some((u) => u?.low !== undefined)) return undefined
  const pick = (key: 'median' | 'low' | 'high') => at.map((u) => { const v = u?.[key]; return v === undefined ? Number.NaN : y(v) })
  return { median: pick('median'), low: pick('low'), high: pick('high') }
}

function logConcentration(sweep: SweepResult, model: StoichiometryModel): DiagramSeries[] {
  return sweepSpecies(sweep, model).map((name) => {
    const series = seriesFor(model, name, sweep.points.map((p) => valueAt(p, (r) => Math.log10(concentrationOf(r, name)))))
    const band = bandAlong(sweep, (r) => r.species.find((s) => s.name === name)?.log10Uncertainty)
    return band ? { ...series, band } : series
  })
}

function solubility(sweep: SweepResult, model: StoichiometryModel, component: string): DiagramSeries[] {
  if (!model.components.some((c) => c.name === component)) return []
  const name = typesetFormula(component)
  const analytical = (r: Result) => r.components.find((c) => c.name === component)?.total ?? Number.NaN
  return [
    {
      key: 'dissolved',
      label: dissolvedLabel(component),
      ...styleForIndex(0),
      labelAt: 'end',
      values: sweep.points.map((p) => valueAt(p, (r) => Math.log10(dissolvedTotal(r, model, component)))),
      ...withBand(bandAlong(sweep, (r) => r.components.find((c) => c.name === component)?.dissolvedUncertainty, Math.log10)),
    },
    {
      key: 'total',
      label: `Total ${name}, dissolved and solid`,
      color: OKABE_ITO[0],
      dash: DASHES[1],
      labelAt: 'start',
      values: sweep.points.map((p) => valueAt(p, (r) => Math.log10(analytical(r)))),
    },
  ]
}

const withBand = (band: DiagramSeries['band']) => (band ? { band } : {})

/**
 * The hand method along the sweep: log10 of each component's factor
 * (estimate / exact free concentration, Result.shortcut); 0 is where the
 * shortcut holds exactly, ±0.3 a factor of two.
 */
function shortcutFactors(sweep: SweepResult, model: StoichiometryModel): DiagramSeries[] {
  const names = model.components.map((c) => c.name).filter((name) => sweep.points.some((p) => p.shortcut?.components.some((c) => c.name === name)))
  return names.map((name) => ({
    key: name,
    label: typesetFormula(name),
    ...styleForIndex(speciesIndex(model, name)),
    labelAt: 'peak' as const,
    values: sweep.points.map((p) => valueAt(p, (r) => Math.log10(r.shortcut?.components.find((c) => c.name === name)?.factor ?? Number.NaN))),
  }))
}

/**
 * A log axis over a near-constant quantity (a total that does not move)
 * would stretch rounding noise across the plot; give it two decades around
 * the value instead. Null lets the plot fit the data.
 */
function atLeastTwoDecades(series: DiagramSeries[]): [number, number] | null {
  let min = Infinity
  let max = -Infinity
  for (const s of series) {
    for (const v of s.values) {
      if (!Number.isFinite(v)) continue
      if (v < min) min = v
      if (v > max) max = v
    }
  }
  if (!(max - min < 2)) return null
  const middle = (max + min) / 2
  return [Math.floor(middle - 1), Math.ceil(middle + 1)]
}

/** Map a sweep to the series of one diagram kind. */
export function diagramData(sweep: SweepResult, model: StoichiometryModel, options: DiagramOptions): DiagramData {
  const component = options.component ?? ''
  const componentName = typesetFormula(component)
  const scale = options.scale ?? MOLAR_SCALE
  let series: DiagramSeries[]
  let yLabel: string
  let yDomain: [number, number] | null = null
  let floor = -Infinity
  switch (options.kind) {
    case 'distribution':
      series = distribution(sweep, model, component)
      yLabel = `Fraction of dissolved ${componentName}`
      yDomain = [0, 1]
      floor = options.shareFloor ?? DISTRIBUTION_FLOOR
      break
    case 'logConcentration':
      series = logConcentration(sweep, model)
      yLabel = `log₁₀ of concentration in ${scale.unit}`
      floor = Math.log10(options.floor ?? DEFAULT_CONCENTRATION_FLOOR)
      break
    case 'solubility':
      series = solubility(sweep, model, component)
      yLabel = `log₁₀ of ${componentName} in ${scale.componentUnit(component)}`
      break
    case 'shortcut':
      series = shortcutFactors(sweep, model)
      yLabel = 'log₁₀ of the factor, by hand ÷ exact (0: the shortcut holds)'
      break
  }
  const below = series.filter((s) => !(maxFinite(s.values) >= floor))
  let shown = options.showAll ? series : series.filter((s) => !below.includes(s))
  // Another unit moves each log curve by the log of its factor (a gap where a mass unit has no molar mass).
  if ((options.kind === 'logConcentration' || options.kind === 'solubility') && scale !== MOLAR_SCALE) {
    shown = shown.map((s) => {
      const factor = (options.kind === 'solubility' ? scale.component(component) : scale.species(s.key)) ?? Number.NaN
      const shift = (values: number[]) => values.map((v) => v + Math.log10(factor))
      return { ...s, values: shift(s.values), ...withBand(s.band && { median: shift(s.band.median), low: shift(s.band.low), high: shift(s.band.high) }) }
    })
  }
  if (options.kind !== 'distribution') yDomain = atLeastTwoDecades(shown)
  return {
    kind: options.kind,
    xLabel: sweepAxisLabel(sweep),
    yLabel,
    xLog: (sweep.variable === 'total' || sweep.variable === 'pressure') && spansDecades(sweep.values),
    yDomain,
    x: sweep.values,
    series: shown,
    hidden: options.showAll ? [] : below.map((s) => s.key),
    failedPoints: sweep.points.flatMap((p, k) => (p.converged ? [] : [k])),
  }
}

/** One row per series per point, the tidy shape a plotting library takes. y is NaN in a gap. */
export interface DiagramRow {
  x: number
  y: number
  key: string
  label: string
}

export function diagramRows(data: DiagramData): DiagramRow[] {
  return data.series.flatMap((s) =>
    data.x.map((x, k) => ({ x, y: s.values[k] ?? Number.NaN, key: s.key, label: s.label })),
  )
}

/** What a diagram draws for the limits of a sweep: a band over each range where a limit holds, and the limit as a line. */
export interface LimitOverlay {
  /** [from, to] of the swept variable, one per range of every limit. */
  bands: { from: number; to: number; label: string }[]
  /** Horizontal lines, in the diagram's y units (log10 of the shown unit); only where the y axis is the capped quantity. */
  lines: { y: number; label: string }[]
}

/**
 * The limit overlay of a diagram. Bands on every kind; a line only on the
 * solubility diagram of the component the limit caps (alone, so its
 * dissolved total is the limited quantity up to a whole coefficient).
 */
export function limitOverlay(
  data: DiagramData,
  windows: LimitWindow[] | undefined,
  limits: Pick<ModelLimit, 'weights' | 'molPerLitre' | 'quantity'>[] | undefined,
  model: StoichiometryModel,
  component: string | null,
  scale: UnitScale = MOLAR_SCALE,
): LimitOverlay {
  const overlay: LimitOverlay = { bands: [], lines: [] }
  ;(windows ?? []).forEach((w, i) => {
    const words = `${w.quantity} ≤ ${w.value} ${w.unit}`
    for (const [from, to] of w.ranges) overlay.bands.push({ from, to, label: words })
    const limit = limits?.[i]
    if (data.kind !== 'solubility' || !limit || !component) return
    const j = model.components.findIndex((c) => c.name === component)
    const held = limit.weights.flatMap((weight, k) => (weight !== 0 ? [k] : []))
    if (j < 0 || held.length !== 1 || held[0] !== j) return
    const y = Math.log10((limit.molPerLitre / limit.weights[j]!) * (scale.component(component) ?? Number.NaN))
    if (Number.isFinite(y)) overlay.lines.push({ y, label: words })
  })
  return overlay
}
