/**
 * Files a chemist takes away: CSV of one result (a tidy table, one quantity
 * a row, so every line has the same columns as RFC 4180 asks) and of a sweep
 * (one row a point), and the JSON as the solver wrote it. Numbers keep full
 * precision: JavaScript's shortest round-trip form, never the rounded table
 * display.
 */

import type { AnswerUncertainty, Result, SweepResult, TitrationCurveResult, TitrationResult } from '../types/result'
import { dissolvedText, hasDissolvedTotal } from './names'
import { MOLAR_SCALE, type UnitScale } from './units'
import { titrationAsSweep } from './titration'

/** Quote a field when it holds a comma, a quote or a line break (RFC 4180 §2.6–2.7). */
export function csvField(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value
}

/** Lines end in CRLF (RFC 4180 §2.1); the last line too. */
export function csvLines(rows: string[][]): string {
  return rows.map((row) => row.map(csvField).join(',') + '\r\n').join('')
}

/**
 * A number in full precision. NaN (nothing computed) is an empty cell;
 * infinities are written so that `Number()` reads them back.
 */
export function csvNumber(value: number | undefined | null): string {
  if (value === undefined || value === null || Number.isNaN(value)) return ''
  return String(value)
}

const RESULT_HEADER = ['section', 'name', 'quantity', 'value', 'unit']

/** A value in mol/L times a unit's factor; empty when the unit cannot take it (a mass unit without a molar mass). */
function scaled(value: number | undefined | null, factor: number | null): string {
  return factor === null || value === undefined || value === null ? '' : csvNumber(value * factor)
}

/**
 * One result as a tidy CSV: conditions, species, solids, gases and
 * components. Concentrations of species and components are in the unit of
 * `scale` (default mol/L, named in the unit column); ionic strength, solid
 * amounts and log10 columns stay in mol/L.
 */
export function resultCsv(result: Result, scale: UnitScale = MOLAR_SCALE): string {
  const rows: string[][] = [RESULT_HEADER]
  const add = (section: string, name: string, quantity: string, value: string, unit = '') =>
    rows.push([section, name, quantity, value, unit])
  /** `QUANTITY ±` (one standard uncertainty, in the quantity's unit) and the constant behind most of it. */
  const addUncertainty = (section: string, name: string, quantity: string, u: AnswerUncertainty, factor: number | null, unit: string) => {
    add(section, name, `${quantity} ±`, scaled(u.sigma, factor), unit)
    if (u.main) add(section, name, `${quantity} ± mostly from`, u.main.reaction, `${csvNumber(u.main.share)} of the variance`)
  }

  add('conditions', '', 'converged', String(result.converged))
  if (result.reason) add('conditions', '', 'reason', result.reason)
  add('conditions', '', 'iterations', String(result.iterations))
  add('conditions', '', 'temperature', csvNumber(result.temperatureC), '°C')
  add('conditions', '', 'pH', csvNumber(result.pH))
  if (result.pHUncertainty) addUncertainty('conditions', '', 'pH', result.pHUncertainty, 1, '')
  add('conditions', '', 'ionic strength', csvNumber(result.ionicStrength), 'mol/L')
  add('conditions', '', 'max scaled residual', csvNumber(result.residuals.maxScaled))
  for (const s of result.species) {
    add('species', s.name, 'charge', String(s.charge))
    const factor = scale.species(s.name)
    add('species', s.name, 'concentration', scaled(s.concentration, factor), scale.unit)
    add('species', s.name, 'log10 concentration', csvNumber(s.log10), 'log10(mol/L)')
    if (s.log10Uncertainty) addUncertainty('species', s.name, 'log10 concentration', s.log10Uncertainty, 1, 'log10(mol/L)')
    add('species', s.name, 'activity', scaled(s.activity, factor), scale.unit)
    add('species', s.name, 'activity coefficient', csvNumber(s.gamma))
    if (s.none) add('species', s.name, 'none', s.none)
  }
  for (const s of result.solids) {
    add('solid', s.name, 'present', String(s.present))
    add('solid', s.name, 'amount', csvNumber(s.amount), 'mol/L')
    if (s.precipitated !== undefined) add('solid', s.name, 'precipitated', csvNumber(s.precipitated), 'mol/L')
    if (s.dissolved !== undefined) add('solid', s.name, 'dissolved', csvNumber(s.dissolved), 'mol/L')
    add('solid', s.name, 'saturation index', csvNumber(s.saturationIndex))
    if (s.saturationIndexUncertainty) addUncertainty('solid', s.name, 'saturation index', s.saturationIndexUncertainty, 1, '')
    if (s.suppressed) add('solid', s.name, 'suppressed', 'true')
    if (s.none) add('solid', s.name, 'none', s.none)
  }
  for (const g of result.gases ?? []) {
    add('gas', g.name, 'partial pressure', csvNumber(g.pressure), 'atm')
    add('gas', g.name, 'log10 partial pressure', csvNumber(g.log10), 'log10(atm)')
    if (g.log10Uncertainty) addUncertainty('gas', g.name, 'log10 partial pressure', g.log10Uncertainty, 1, 'log10(atm)')
    if (g.none) add('gas', g.name, 'none', g.none)
  }
  for (const c of result.components) {
    add('component', c.name, 'mode', c.mode)
    const factor = scale.component(c.name)
    const unit = scale.componentUnit(c.name)
    // The free value of a pressure component is in atm and of an excess solid an activity: never converted.
    const fixed = c.mode === 'pressure' || c.mode === 'excess'
    add('component', c.name, 'total', scaled(c.total, factor), unit)
    add('component', c.name, 'free', fixed ? csvNumber(c.free) : scaled(c.free, factor), c.mode === 'pressure' ? 'atm' : c.mode === 'excess' ? '' : unit)
    if (c.freeConcentration !== undefined) add('component', c.name, 'free concentration', scaled(c.freeConcentration, factor), unit)
    if (c.freeActivity !== undefined) add('component', c.name, 'free activity', fixed ? csvNumber(c.freeActivity) : scaled(c.freeActivity, factor), fixed ? '' : unit)
    if (c.dissolved !== undefined) add('component', c.name, 'dissolved', scaled(c.dissolved, factor), unit)
    if (c.dissolvedUncertainty) addUncertainty('component', c.name, 'dissolved', c.dissolvedUncertainty, factor, unit)
  }
  if (result.uncertainty) {
    add('conditions', '', 'uncertainty method', result.uncertainty.method)
    for (const k of result.uncertainty.constants) add('constant', k.reaction, `${k.kind} uncertainty in log10 K`, csvNumber(k.logKUncertainty))
  }
  for (const w of result.warnings ?? []) add('conditions', '', 'warning', w)
  return csvLines(rows)
}

/** Header of the swept variable's column, with its unit. */
function sweepVariableHeader(sweep: SweepResult): string {
  switch (sweep.variable) {
    case 'pH':
      return 'swept pH'
    case 'total':
      return `total ${sweep.component ?? ''} (mol/L)`
    case 'temperature':
      return 'temperature (°C)'
    case 'pressure':
      return `pressure ${sweep.component ?? ''} (atm)`
    case 'volume':
      return 'added volume (mL)'
  }
}

/**
 * A sweep as CSV, one row a point: the swept value, whether it converged,
 * pH, ionic strength, every species' concentration, each component's
 * dissolved total ("dissolved Ni", Σ ν·c over the aqueous species), then
 * each solid's amount and saturation index (where a metal drops out is often the point of
 * the sweep). A failed point keeps its row with empty numbers and the
 * reason, so row k is always point k.
 */
export function sweepCsv(sweep: SweepResult, scale: UnitScale = MOLAR_SCALE): string {
  return curveCsv(sweepVariableHeader(sweep), sweep.values, sweep.points, { headers: [], cells: () => [] }, scale)
}

/**
 * A titration curve as CSV: the added volume (mL), whether it converged,
 * pH, dpH/dV, the buffer capacity β, then the columns of a sweep's CSV
 * (ionic strength, every species, dissolved totals, solids).
 */
export function titrationCsv(t: TitrationCurveResult, scale: UnitScale = MOLAR_SCALE): string {
  return curveCsv(sweepVariableHeader(titrationAsSweep(t)), t.values, t.points, {
    headers: ['dpH/dV (per mL)', 'buffer capacity (mol/L per pH)'],
    cells: (k, point) => [csvNumber(t.derivative[k]), csvNumber(point.bufferCapacity)],
  }, scale)
}

interface ExtraColumns { headers: string[]; cells: (k: number, point: Result) => string[] }

function curveCsv(variableHeader: string, values: number[], points: Result[], extra: ExtraColumns, scale: UnitScale): string {
  const names: string[] = []
  const solids: string[] = []
  const components: string[] = []
  for (const point of points) {
    for (const s of point.species) if (!names.includes(s.name)) names.push(s.name)
    for (const s of point.solids) if (!solids.includes(s.name)) solids.push(s.name)
    for (const c of point.components) if (c.dissolved !== undefined && hasDissolvedTotal(c.name) && !components.includes(c.name)) components.push(c.name)
  }
  const bands = bandColumns(points, names, components, solids, scale)
  const header = [
    variableHeader,
    'converged',
    'pH',
    ...extra.headers,
    'ionic strength (mol/L)',
    ...names.map((n) => `${n} (${scale.unit})`),
    ...components.map((n) => `${dissolvedText(n)} (${scale.componentUnit(n)})`),
    ...solids.flatMap((n) => [`${n} amount (mol/L)`, `${n} saturation index`]),
    ...bands.headers,
    'reason',
  ]
  const blanks = extra.headers.length + names.length + components.length + 2 * solids.length + bands.headers.length
  const rows = values.map((x, k) => {
    const point = points[k]
    if (!point || !point.converged) {
      return [csvNumber(x), 'false', '', '', ...Array<string>(blanks).fill(''), point?.reason ?? 'no result for this point']
    }
    const byName = new Map(point.species.map((s) => [s.name, s.concentration]))
    const solidByName = new Map(point.solids.map((s) => [s.name, s]))
    const dissolvedByName = new Map(point.components.map((c) => [c.name, c.dissolved]))
    return [
      csvNumber(x),
      'true',
      csvNumber(point.pH),
      ...extra.cells(k, point),
      csvNumber(point.ionicStrength),
      ...names.map((n) => scaled(byName.get(n), scale.species(n))),
      ...components.map((n) => scaled(dissolvedByName.get(n), scale.component(n))),
      ...solids.flatMap((n) => [csvNumber(solidByName.get(n)?.amount), csvNumber(solidByName.get(n)?.saturationIndex)]),
      ...bands.cells(k, point),
      '',
    ]
  })
  return csvLines([header, ...rows])
}

/**
 * A Monte Carlo's columns (`uncertainty draws N`), after the others so the
 * usual columns keep their places: the median and the 2.5 and 97.5 %
 * quantiles of the pH, of log10 c of every species, of each dissolved total
 * (in the chosen unit) and of each saturation index. None without draws.
 */
function bandColumns(points: Result[], names: string[], components: string[], solids: string[], scale: UnitScale): ExtraColumns {
  if (!points.some((p) => p.uncertainty?.method === 'monte-carlo')) return { headers: [], cells: () => [] }
  const three = (what: string) => [`${what} median`, `${what} 2.5 %`, `${what} 97.5 %`]
  const cells = (u: AnswerUncertainty | undefined, factor: number | null = 1) => [scaled(u?.median, factor), scaled(u?.low, factor), scaled(u?.high, factor)]
  return {
    headers: [
      ...three('pH'),
      ...names.flatMap((n) => three(`${n} log10 c`)),
      ...components.flatMap((n) => three(`${dissolvedText(n)} (${scale.componentUnit(n)})`)),
      ...solids.flatMap((n) => three(`${n} saturation index`)),
    ],
    cells: (_k, point) => [
      ...cells(point.pHUncertainty),
      ...names.flatMap((n) => cells(point.species.find((s) => s.name === n)?.log10Uncertainty)),
      ...components.flatMap((n) => cells(point.components.find((c) => c.name === n)?.dissolvedUncertainty, scale.component(n))),
      ...solids.flatMap((n) => cells(point.solids.find((s) => s.name === n)?.saturationIndexUncertainty)),
    ],
  }
}

/** The JSON export: the object as the solver produced it, indented for reading. */
export function jsonExport(value: Result | SweepResult | TitrationResult): string {
  return JSON.stringify(value, null, 2) + '\n'
}

/** A file name safe on every common file system, from a title or slug; never empty. */
export function safeFileName(base: string): string {
  const cleaned = base
    .normalize('NFKD')
    .replace(/[^\w.-]+/g, '-')
    .replace(/-{2,}/g, '-')
    .replace(/^[-.]+|[-.]+$/g, '')
  return cleaned.slice(0, 120) || 'equipoise-result'
}
