/**
 * What the workbench draws from a map answer, as plain numbers the tests can
 * read: the predominance of a component (which species or solid holds the
 * largest share of its total in each cell, and for each candidate the
 * margin by which it leads, whose zero contour is that region's boundary),
 * the colour map of a chosen quantity, the solids' SI = 0 boundaries, and
 * the grid CSV. Cells run row after row: cell k is row ⌊k / nx⌋ (y) and
 * column k mod nx (x).
 */
import type { Model } from '../poise/model'
import type { MapAnswer, MapAxis } from '../types/result'
import { mapCell, mapQuantity } from './map-columns'
import { dissolvedLabel } from './names'
import { csvLines, csvNumber } from './export'
import { typesetFormula } from './typeset'
import { MOLAR_SCALE, type UnitScale } from './units'

/** The part of the model the map readers need. */
export type MapModel = Pick<Model, 'components' | 'species' | 'solids'>

/** Axis label in words with its unit (a log axis is drawn in log10 of it, ticks written as powers of ten). */
export function mapAxisLabel(axis: MapAxis): string {
  const name = axis.component ? typesetFormula(axis.component) : ''
  switch (axis.variable) {
    case 'pH': return 'pH'
    case 'temperature': return 'Temperature (°C)'
    case 'total': return `Total ${name} (mol/L)`
    case 'pressure': return `Partial pressure of ${name} (atm)`
  }
}

/** Where a value lies on its axis: log10 for a log axis (the grid is even there). */
export function axisPosition(axis: MapAxis, v: number): number {
  return axis.log ? Math.log10(v) : v
}

/** The index of the axis value nearest to a position on it (log10 of the value on a log axis). */
export function nearestIndex(axis: MapAxis, position: number): number {
  let best = 0
  let bestDistance = Infinity
  axis.values.forEach((value, i) => {
    const d = Math.abs(axisPosition(axis, value) - position)
    if (d < bestDistance) { best = i; bestDistance = d }
  })
  return best
}

/**
 * The edges of the grid along an axis, as positions (log10 on a log axis):
 * half a step beyond the first and last values. A map is drawn in positions,
 * where its grid is even, so a contour's grid lies on its cells.
 */
export function positionExtent(axis: MapAxis): [number, number] {
  const p = axis.values.map((v) => axisPosition(axis, v))
  const half = p.length > 1 ? (p[p.length - 1]! - p[0]!) / (p.length - 1) / 2 : 0.5
  return [p[0]! - half, p[p.length - 1]! + half]
}

/** Components a predominance map can be drawn for: held by some species or solid, never negatively (H+ is not one). */
export function predominanceComponents(model: MapModel): string[] {
  const holders = [...model.species, ...model.solids]
  return model.components
    .filter((_, j) => holders.some((h) => (h.nu[j] ?? 0) > 0) && holders.every((h) => (h.nu[j] ?? 0) >= 0))
    .map((c) => c.name)
}

export interface Predominance {
  component: string
  /** The species and solids that hold the component, in model order (species first). */
  candidates: { name: string; kind: 'species' | 'solid' }[]
  /** For each cell, the index of the candidate with the largest share of the component's total; −1 where the cell did not converge or holds none. */
  dominant: Int32Array
  /** Per cell, the share of the component's total its dominant holder has (NaN where none). */
  leadShare: Float64Array
  /** For each candidate, per cell: its share minus the largest other share (≥ 0 where it dominates; NaN where the cell has none). */
  margin: Float64Array[]
  /** Candidates that dominate at least one cell, with the cell deepest inside their region (for its label). */
  regions: { candidate: number; cell: number; cells: number }[]
}

/**
 * The predominance of `component`: in each cell, the share of its total
 * (dissolved plus precipitated) each species and solid holds, ν × amount /
 * total, and which leads. The margins are continuous over the grid, so
 * their zero contours are smooth boundaries.
 */
export function predominance(answer: MapAnswer, model: MapModel, component: string): Predominance {
  const j = model.components.findIndex((c) => c.name === component)
  const candidates = [
    ...model.species.filter((s) => (s.nu[j] ?? 0) > 0).map((s) => ({ name: s.name, kind: 'species' as const, nu: s.nu[j]! })),
    ...model.solids.filter((s) => (s.nu[j] ?? 0) > 0).map((s) => ({ name: s.name, kind: 'solid' as const, nu: s.nu[j]! })),
  ]
  const n = answer.cells.templateOf.length
  const amounts = candidates.map((c) => mapQuantity(answer, c.kind === 'species' ? ['species', c.name, 'concentration'] : ['solids', c.name, 'amount']))
  const failed = failedMask(answer)
  const margin = candidates.map(() => new Float64Array(n).fill(Number.NaN))
  const dominant = new Int32Array(n).fill(-1)
  const leadShare = new Float64Array(n).fill(Number.NaN)
  const shares = new Float64Array(candidates.length)
  for (let k = 0; k < n; k++) {
    if (failed[k]) continue
    let total = 0
    for (let c = 0; c < candidates.length; c++) {
      const a = amounts[c]![k]!
      shares[c] = Number.isFinite(a) && a > 0 ? candidates[c]!.nu * a : 0
      total += shares[c]!
    }
    if (!(total > 0)) continue
    let first = -1
    let second = -1
    for (let c = 0; c < candidates.length; c++) {
      shares[c] = shares[c]! / total
      if (first < 0 || shares[c]! > shares[first]!) { second = first; first = c } else if (second < 0 || shares[c]! > shares[second]!) second = c
    }
    dominant[k] = first
    leadShare[k] = shares[first]!
    for (let c = 0; c < candidates.length; c++) {
      const other = c === first ? (second >= 0 ? shares[second]! : 0) : shares[first]!
      margin[c]![k] = shares[c]! - other
    }
  }
  const regions: Predominance['regions'] = []
  candidates.forEach((_, c) => {
    let best = -1
    let cells = 0
    for (let k = 0; k < n; k++) {
      if (dominant[k] !== c) continue
      cells++
      if (best < 0 || depth(dominant, answer.x.values.length, k) > depth(dominant, answer.x.values.length, best)) best = k
    }
    if (best >= 0) regions.push({ candidate: c, cell: best, cells })
  })
  return { component, candidates: candidates.map(({ name, kind }) => ({ name, kind })), dominant, leadShare, margin, regions }
}

/** How far cell k lies from a cell of another region or the grid's edge (in cells, by rings), for placing a label. */
function depth(dominant: Int32Array, nx: number, k: number): number {
  const ny = dominant.length / nx
  const i = Math.floor(k / nx)
  const j = k % nx
  const own = dominant[k]
  for (let r = 1; ; r++) {
    if (i - r < -1 || j - r < -1 || i + r > ny || j + r > nx) return r - 1
    for (let di = -r; di <= r; di++) {
      for (let dj = -r; dj <= r; dj++) {
        if (Math.max(Math.abs(di), Math.abs(dj)) !== r) continue
        const ii = i + di
        const jj = j + dj
        if (ii < 0 || jj < 0 || ii >= ny || jj >= nx) return r - 1 + 0.5
        if (dominant[ii * nx + jj] !== own) return r - 1
      }
    }
  }
}

/** A quantity a colour map can show. */
export interface MapQuantity {
  id: string
  label: string
  /** The legend's words, with the unit. */
  legend: string
}

/** The colour map's choices: the pH, each dissolved total and each species' log c (in the chosen unit), each solid's SI. */
export function mapQuantities(model: MapModel, scale: UnitScale = MOLAR_SCALE): MapQuantity[] {
  const out: MapQuantity[] = [{ id: 'pH', label: 'pH', legend: 'pH' }]
  for (const c of model.components) {
    if (c.name === 'H+') continue
    out.push({ id: `dissolved:${c.name}`, label: `log ${dissolvedLabel(c.name)}`, legend: `log10 ${dissolvedLabel(c.name)} (${scale.componentUnit(c.name)})` })
  }
  for (const s of model.species) out.push({ id: `species:${s.name}`, label: `log c ${typesetFormula(s.name)}`, legend: `log10 c of ${typesetFormula(s.name)} (${scale.unit})` })
  for (const s of model.solids) out.push({ id: `si:${s.name}`, label: `SI ${typesetFormula(s.name)}`, legend: `saturation index of ${typesetFormula(s.name)}` })
  return out
}

/** The chosen quantity over the grid; NaN where a cell lacks it (did not converge, or has none). */
export function quantityGrid(answer: MapAnswer, id: string, scale: UnitScale = MOLAR_SCALE): Float64Array {
  const [kind, name] = splitId(id)
  const failed = failedMask(answer)
  let grid: Float64Array
  if (kind === 'pH') grid = mapQuantity(answer, ['pH'])
  else if (kind === 'si') grid = mapQuantity(answer, ['solids', name, 'saturationIndex'])
  else {
    const raw = kind === 'dissolved' ? mapQuantity(answer, ['components', name, 'dissolved']) : mapQuantity(answer, ['species', name, 'concentration'])
    const factor = kind === 'dissolved' ? scale.component(name) : scale.species(name)
    grid = raw.map((v) => (factor !== null && v > 0 ? Math.log10(v * factor) : Number.NaN))
  }
  for (let k = 0; k < grid.length; k++) if (failed[k]) grid[k] = Number.NaN
  return grid
}

function splitId(id: string): [string, string] {
  const at = id.indexOf(':')
  return at < 0 ? [id, ''] : [id.slice(0, at), id.slice(at + 1)]
}

/** 1 where a cell did not converge. */
export function failedMask(answer: MapAnswer): Uint8Array {
  const n = answer.cells.templateOf.length
  const nx = answer.x.values.length
  const out = new Uint8Array(n)
  // One cell per template tells whether all of its cells converged (a template holds `converged`).
  const byTemplate = new Map<number, boolean>()
  for (let k = 0; k < n; k++) {
    const t = answer.cells.templateOf[k]!
    let ok = byTemplate.get(t)
    if (ok === undefined) {
      ok = mapCell(answer, Math.floor(k / nx), k % nx).converged
      byTemplate.set(t, ok)
    }
    out[k] = ok ? 0 : 1
  }
  return out
}

/**
 * Where a solid counts as saturated for its boundary line: a solid present
 * has SI 0 to rounding (±1e-15), so the line is drawn a hair below 0 and
 * never wanders through the cells where the solid is present.
 */
export const SATURATED_SI = -1e-6

/** The solids whose SI changes sign somewhere on the grid: their SI = 0 lines are boundaries worth drawing. */
export function solidBoundaries(answer: MapAnswer, model: MapModel): { name: string; si: Float64Array }[] {
  return model.solids.flatMap((s) => {
    const si = quantityGrid(answer, `si:${s.name}`)
    let above = false
    let below = false
    for (const v of si) { if (v >= SATURATED_SI) above = true; else if (v < SATURATED_SI) below = true }
    return above && below ? [{ name: s.name, si }] : []
  })
}

/** A cell on a solid's SI = 0 line (saturated beside a cell that is not), the middle one of them, for its label; −1 when none. */
export function boundaryAnchor(si: Float64Array, nx: number): number {
  const ny = si.length / nx
  const edge: number[] = []
  for (let k = 0; k < si.length; k++) {
    if (!(si[k]! >= SATURATED_SI)) continue
    const i = Math.floor(k / nx)
    const j = k % nx
    const below = (ii: number, jj: number) => ii >= 0 && jj >= 0 && ii < ny && jj < nx && si[ii * nx + jj]! < SATURATED_SI
    if (below(i - 1, j) || below(i + 1, j) || below(i, j - 1) || below(i, j + 1)) edge.push(k)
  }
  return edge.length ? edge[Math.floor(edge.length / 2)]! : -1
}

/**
 * The grid as CSV, one line a cell: both axes' values, whether it
 * converged, pH, ionic strength, each dissolved total (in the chosen unit),
 * each species' log10 c (mol/L), each solid's SI and amount, the dominant
 * holder of `component` when given, and the reason of a cell that failed.
 */
export function mapCsv(answer: MapAnswer, model: MapModel, options: { scale?: UnitScale; component?: string | null } = {}): string {
  const scale = options.scale ?? MOLAR_SCALE
  const axisName = (a: MapAxis) => (a.component ? `${a.variable} ${a.component}` : a.variable) + (a.variable === 'total' ? ' (mol/L)' : a.variable === 'temperature' ? ' (°C)' : a.variable === 'pressure' ? ' (atm)' : '')
  const components = model.components.filter((c) => c.name !== 'H+').map((c) => c.name)
  const head = [
    axisName(answer.y), axisName(answer.x), 'converged', 'pH', 'ionic strength (mol/L)',
    ...components.map((c) => `${dissolvedLabel(c)} (${scale.componentUnit(c)})`),
    ...model.species.map((s) => `log10 ${s.name} (mol/L)`),
    ...model.solids.flatMap((s) => [`SI ${s.name}`, `${s.name} (mol/L)`]),
    ...(options.component ? [`dominant ${options.component}`] : []),
    'reason',
  ]
  const rule = options.component ? predominance(answer, model, options.component) : null
  const rows: string[][] = [head]
  const nx = answer.x.values.length
  answer.y.values.forEach((yv, i) => answer.x.values.forEach((xv, j) => {
    const cell = mapCell(answer, i, j)
    const k = i * nx + j
    const ok = cell.converged
    const num = (v: number | null | undefined) => (ok ? csvNumber(v) : '')
    rows.push([
      csvNumber(yv), csvNumber(xv), ok ? 'yes' : 'no', num(cell.pH), num(cell.ionicStrength),
      ...components.map((c) => {
        const d = cell.components.find((x) => x.name === c)?.dissolved
        const f = scale.component(c)
        return ok && d !== undefined && f !== null ? csvNumber(d * f) : ''
      }),
      ...model.species.map((s) => num(cell.species.find((x) => x.name === s.name)?.log10)),
      ...model.solids.flatMap((s) => {
        const r = cell.solids.find((x) => x.name === s.name)
        return [num(r?.saturationIndex), num(r?.amount)]
      }),
      ...(rule ? [rule.dominant[k]! >= 0 ? rule.candidates[rule.dominant[k]!]!.name : ''] : []),
      cell.reason ?? '',
    ])
  }))
  return csvLines(rows)
}
