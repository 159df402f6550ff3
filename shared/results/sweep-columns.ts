/**
 * A sweep answer by columns: the shape of a point (names, modes, messages —
 * everything but its numbers) is kept once as a template, and each number of
 * that shape is one Float64Array along the sweep (log10 c of Cu²⁺, γ of OH⁻,
 * the SI of a solid, pH, I …). Points that end in another shape (a solid
 * joins and its `none` note goes, a point fails with a reason) get a template
 * of their own; a sweep usually has one to three.
 *
 * `sweepPoint` makes the Result of one point on demand, equal to the point
 * the solver made (the same numbers, bit for bit, the same keys in the same
 * order, so the same JSON); `sweepView` is the SweepResult contract (points
 * with species objects) over the columns, making points only when read.
 */
import type { PointColumns, Result, SweepResult } from '../types/result'

export type { PointColumns }

/** Stands for a number in a template (never a string a Result holds). */
const SLOT = '\u0000#'

export interface SweepColumns {
  format: 'sweep-columns'
  variable: SweepResult['variable']
  component: string | null
  values: number[]
  limits?: SweepResult['limits']
  /** A point's shape: the Result with each number replaced by SLOT. */
  templates: unknown[]
  /** For each point, the index of its template. */
  templateOf: Uint16Array
  /** For each point, its row among the points of its template. */
  rowOf: Uint32Array
  /** For each template, its numbers by column: slot s of row r is columns[t][s * rows + r]. */
  columns: Float64Array[]
  /** For each template, how many points have it. */
  rows: number[]
}

/**
 * Columns written one point at a time, so a caller that solves point by
 * point (a map's cells) never holds every point's objects: `add` keeps the
 * point's numbers and lets its objects go; `build` gives the columns.
 */
export class ColumnsBuilder {
  private readonly index = new Map<string, number>()
  private readonly templates: unknown[] = []
  /** For each template, its rows' numbers one row after the other (row r, slot s at r × slots + s). */
  private readonly numbers: number[][] = []
  private readonly slots: number[] = []
  private readonly counts: number[] = []
  private readonly templateOf: number[] = []
  private readonly rowOf: number[] = []

  get length(): number { return this.templateOf.length }

  add(point: Result): void {
    const found: number[] = []
    const key = JSON.stringify(point, (_k, v) => {
      if (typeof v === 'number') { found.push(v); return SLOT }
      return v
    })
    let t = this.index.get(key)
    if (t === undefined) {
      if (this.templates.length === 0xffff) throw new Error('an answer with more than 65535 shapes of point')
      t = this.templates.length
      this.index.set(key, t)
      this.templates.push(JSON.parse(key))
      this.numbers.push([])
      this.slots.push(found.length)
      this.counts.push(0)
    }
    this.templateOf.push(t)
    this.rowOf.push(this.counts[t]++)
    const rowsOfT = this.numbers[t]
    for (const v of found) rowsOfT.push(v)
  }

  build(): Omit<SweepColumns, 'format' | 'variable' | 'component' | 'values' | 'limits'> {
    const rows = [...this.counts]
    const columns = this.numbers.map((flat, t) => {
      const n = rows[t]
      const slots = this.slots[t]
      const col = new Float64Array(slots * n)
      for (let r = 0; r < n; r++) for (let s = 0; s < slots; s++) col[s * n + r] = flat[r * slots + s]
      return col
    })
    return { templates: this.templates, templateOf: Uint16Array.from(this.templateOf), rowOf: Uint32Array.from(this.rowOf), columns, rows }
  }
}

/** The columns of a sweep answer. */
export function toSweepColumns(sweep: SweepResult): SweepColumns {
  const builder = new ColumnsBuilder()
  for (const point of sweep.points) builder.add(point)
  const out: SweepColumns = { format: 'sweep-columns', variable: sweep.variable, component: sweep.component, values: sweep.values, ...builder.build() }
  if (sweep.limits !== undefined) out.limits = sweep.limits
  return out
}

/** The Result of point i, made from the columns. */
export function sweepPoint(columns: PointColumns, i: number): Result {
  const t = columns.templateOf[i]
  const rows = columns.rows[t]
  const col = columns.columns[t]
  let s = 0
  const fill = (v: unknown): unknown => {
    if (v === SLOT) return toNumber(col[(s++) * rows + columns.rowOf[i]])
    if (Array.isArray(v)) return v.map(fill)
    if (v !== null && typeof v === 'object') {
      const o: Record<string, unknown> = {}
      for (const k of Object.keys(v)) o[k] = fill((v as Record<string, unknown>)[k])
      return o
    }
    return v
  }
  return fill(columns.templates[t]) as Result
}

/** The SweepResult over the columns: `points[i]` is made when read (and kept). */
export function sweepView(columns: SweepColumns): SweepResult {
  const made: Result[] = []
  const n = columns.templateOf.length
  // Own (undefined) entries, so map/filter/forEach visit every index through the trap.
  const points = new Proxy(Array.from<Result>({ length: n }), {
    get(target, key, receiver) {
      if (typeof key === 'string') {
        const i = Number(key)
        if (Number.isInteger(i) && i >= 0 && i < n && String(i) === key) return (made[i] ??= sweepPoint(columns, i))
      }
      return Reflect.get(target, key, receiver)
    },
  })
  const view: SweepResult = { variable: columns.variable, component: columns.component, values: columns.values, points }
  if (columns.limits !== undefined) view.limits = columns.limits
  return view
}

/** Every point as a plain SweepResult (what `JSON.stringify` of the solver's answer gives). */
export function fromSweepColumns(columns: SweepColumns): SweepResult {
  const points = Array.from(columns.templateOf, (_t, i) => sweepPoint(columns, i))
  const out: SweepResult = { variable: columns.variable, component: columns.component, values: columns.values, points }
  if (columns.limits !== undefined) out.limits = columns.limits
  return out
}

/**
 * One quantity along the sweep, by path into a point: e.g.
 * `['species', 'Cu^2+', 'log10']` (an array of entries with `name` is
 * indexed by name), `['pH']`. NaN at points whose shape lacks it or holds
 * null there.
 */
export function sweepQuantity(columns: PointColumns, path: (string | number)[]): Float64Array {
  const n = columns.templateOf.length
  const out = new Float64Array(n).fill(Number.NaN)
  const slotOf = columns.templates.map(template => slotAt(template, path))
  for (let i = 0; i < n; i++) {
    const t = columns.templateOf[i]
    const s = slotOf[t]
    if (s >= 0) out[i] = columns.columns[t][s * columns.rows[t] + columns.rowOf[i]] ?? Number.NaN
  }
  return out
}

/**
 * Columns that came as JSON hold null where the solver's number was NaN
 * (JSON has no NaN): as the point's own JSON would have it.
 */
function toNumber(v: number | null): number {
  return v === null ? (null as unknown as number) : v
}

/** The slot number of a path in a template, or −1. */
function slotAt(template: unknown, path: (string | number)[]): number {
  let s = 0
  let found = -1
  const walk = (v: unknown, depth: number, onPath: boolean): void => {
    if (v === SLOT) {
      if (onPath && depth === path.length) found = s
      s++
      return
    }
    if (v === null || typeof v !== 'object') return
    const step = path[depth]
    if (Array.isArray(v)) {
      v.forEach((item, k) => {
        const named = item !== null && typeof item === 'object' && (item as { name?: unknown }).name
        walk(item, depth + 1, onPath && depth < path.length && (step === k || (typeof step === 'string' && named === step)))
      })
      return
    }
    for (const k of Object.keys(v)) walk((v as Record<string, unknown>)[k], depth + 1, onPath && depth < path.length && k === step)
  }
  walk(template, 0, true)
  return found
}
