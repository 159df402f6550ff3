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

/** What a builder gives: the columns of SweepColumns without the sweep's own fields. */
export type PointParts<C = Float64Array> = Omit<SweepColumns, 'format' | 'variable' | 'component' | 'values' | 'limits' | 'columns'> & { columns: C[] }

/** The columns of a sweep answer. */
export function toSweepColumns(sweep: SweepResult): SweepColumns {
  const builder = new ColumnsBuilder(sweep.points.length)
  for (const point of sweep.points) builder.add(point)
  const out: SweepColumns = { format: 'sweep-columns', variable: sweep.variable, component: sweep.component, values: sweep.values, ...builder.build() }
  if (sweep.limits !== undefined) out.limits = sweep.limits
  return out
}

/** A template compiled for matching: what JSON.stringify would write, numbers as slots. */
type Shape =
  | { kind: 'slot' }
  | { kind: 'value', value: string | boolean | null }
  | { kind: 'array', items: Shape[] }
  | { kind: 'object', keys: string[], values: Shape[] }

function shapeOf(template: unknown): Shape {
  if (template === SLOT) return { kind: 'slot' }
  if (Array.isArray(template)) return { kind: 'array', items: template.map(shapeOf) }
  if (template !== null && typeof template === 'object') {
    const keys = Object.keys(template)
    return { kind: 'object', keys, values: keys.map(k => shapeOf((template as Record<string, unknown>)[k])) }
  }
  return { kind: 'value', value: template as string | boolean | null }
}

/** The largest chunk of rows the builder allocates at once. */
const CHUNK_ROWS = 2048

/** A value JSON.stringify leaves out of an object (and writes as null in an array). */
const skipped = (v: unknown) => v === undefined || typeof v === 'function' || typeof v === 'symbol'

/**
 * Columns written one point at a time, so a caller that solves point by
 * point (a sweep in the worker, a map's cells) never holds every point's
 * objects: `add` matches the point against the templates seen so far (no
 * string, no copy), keeps its numbers in chunks of rows and lets its objects
 * go; `build` gives the columns (equal to `toSweepColumns` of the same
 * points), `buildInPieces` the same without joining the chunks.
 * `expectedPoints`, when known, sizes the chunks so little room goes unused.
 */
export class ColumnsBuilder {
  private readonly shapes: Shape[] = []
  private readonly templates: unknown[] = []
  /** For each template, its rows in chunks; in a chunk of capacity c, slot s of its row r is at s·c + r. */
  private readonly chunks: { data: Float64Array, capacity: number, rows: number }[][] = []
  private readonly rows: number[] = []
  private readonly slots: number[] = []
  private templateOf: Uint16Array
  private rowOf: Uint32Array
  private scratch = new Float64Array(256)
  private found = 0
  private count = 0
  private last = 0

  constructor(private readonly expectedPoints?: number) {
    this.templateOf = new Uint16Array(expectedPoints ?? 64)
    this.rowOf = new Uint32Array(expectedPoints ?? 64)
  }

  get length(): number { return this.count }

  /** Adds the next point. */
  add(point: Result): void {
    const i = this.count
    if (i === this.templateOf.length) {
      const templateOf = new Uint16Array(i * 2); templateOf.set(this.templateOf); this.templateOf = templateOf
      const rowOf = new Uint32Array(i * 2); rowOf.set(this.rowOf); this.rowOf = rowOf
    }
    let t = this.matching(point)
    if (t < 0) t = this.newTemplate(point)
    const slots = this.slots[t]
    const chunks = this.chunks[t]
    let chunk = chunks[chunks.length - 1]
    if (!chunk || chunk.rows === chunk.capacity) {
      // Chunks of 64 rows, doubling to 2,048: little unused room however the points fall among the templates.
      const capacity = Math.max(1, Math.min(CHUNK_ROWS, this.expectedPoints === undefined ? Infinity : this.expectedPoints - i, chunk ? chunk.capacity * 2 : 64))
      chunk = { data: new Float64Array(slots * capacity), capacity, rows: 0 }
      chunks.push(chunk)
    }
    const { data, capacity, rows: r } = chunk
    for (let s = 0; s < slots; s++) data[s * capacity + r] = this.scratch[s]
    chunk.rows = r + 1
    this.templateOf[i] = t
    this.rowOf[i] = this.rows[t]++
    this.count = i + 1
  }

  /** The columns of the points added, each in one array. */
  build(): PointParts<Float64Array> {
    return this.buildInPieces((pieces, length) => {
      if (pieces.length === 1) return pieces[0]
      const col = new Float64Array(length)
      let at = 0
      for (const piece of pieces) { col.set(piece, at); at += piece.length }
      return col
    })
  }

  /**
   * The same with each column given as its pieces in order (`joinPieces`
   * makes what stands for a column, e.g. a PiecedArray for the binary form):
   * nothing is copied, so the columns are never in memory twice.
   */
  buildInPieces<C>(joinPieces: (pieces: Float64Array[], length: number) => C): PointParts<C> {
    if (this.expectedPoints !== undefined && this.count !== this.expectedPoints) throw new Error(`${this.count} points added, ${this.expectedPoints} expected`)
    const columns = this.chunks.map((chunks, t) => {
      const slots = this.slots[t]
      // One chunk: packed in place (slot s from s·capacity to s·rows, moving left, so in order).
      if (chunks.length === 1) {
        const { data, capacity, rows } = chunks[0]
        if (capacity !== rows) for (let s = 1; s < slots; s++) data.copyWithin(s * rows, s * capacity, s * capacity + rows)
        return joinPieces([data.subarray(0, slots * rows)], slots * rows)
      }
      const pieces: Float64Array[] = []
      for (let s = 0; s < slots; s++) for (const { data, capacity, rows } of chunks) pieces.push(data.subarray(s * capacity, s * capacity + rows))
      return joinPieces(pieces, slots * this.rows[t])
    })
    const n = this.count
    return {
      templates: this.templates,
      templateOf: n === this.templateOf.length ? this.templateOf : this.templateOf.slice(0, n),
      rowOf: n === this.rowOf.length ? this.rowOf : this.rowOf.slice(0, n),
      columns,
      rows: [...this.rows],
    }
  }

  private matching(point: Result): number {
    const n = this.shapes.length
    for (let k = 0; k < n; k++) {
      const t = (this.last + k) % n
      this.found = 0
      if (this.match(point, this.shapes[t])) {
        this.last = t
        return t
      }
    }
    return -1
  }

  private newTemplate(point: Result): number {
    if (this.shapes.length === 0xffff) throw new Error('a sweep answer with more than 65535 shapes of point')
    const template = JSON.parse(JSON.stringify(point, (_k, v) => (typeof v === 'number' ? SLOT : v)))
    const shape = shapeOf(template)
    this.found = 0
    if (!this.match(point, shape)) throw new Error('a sweep point does not match its own shape')
    const t = this.shapes.length
    this.shapes.push(shape)
    this.templates.push(template)
    this.slots.push(this.found)
    this.rows.push(0)
    this.chunks.push([])
    this.last = t
    return t
  }

  /** Whether v is written as `shape` by JSON.stringify; its numbers go to the scratch row. */
  private match(v: unknown, shape: Shape): boolean {
    const kind = shape.kind
    if (kind === 'slot') {
      if (typeof v !== 'number') return false
      if (this.found === this.scratch.length) {
        const grown = new Float64Array(this.scratch.length * 2)
        grown.set(this.scratch)
        this.scratch = grown
      }
      this.scratch[this.found++] = v
      return true
    }
    if (kind === 'object') {
      if (v === null || typeof v !== 'object' || Array.isArray(v)) return false
      const o = v as Record<string, unknown>
      const keys = shape.keys
      const values = shape.values
      let k = 0
      // Results are plain objects: for…in visits their own keys in JSON.stringify's order.
      for (const key in o) {
        const item = o[key]
        if (item === undefined || typeof item === 'function' || typeof item === 'symbol') continue
        if (key !== keys[k] || !this.match(item, values[k])) return false
        k++
      }
      return k === keys.length
    }
    if (kind === 'array') {
      const items = shape.items
      if (!Array.isArray(v) || v.length !== items.length) return false
      for (let k = 0; k < v.length; k++) if (!this.match(v[k], items[k])) return false
      return true
    }
    return v === shape.value || (shape.value === null && skipped(v))
  }
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

/** A run of points [from, to) of some columns (a stored slice, or part of one). */
export interface ColumnsRange {
  columns: PointColumns
  from: number
  to: number
}

/**
 * The columns of the points of several ranges one after another, joined
 * column by column without making a Result: equal, number for number and
 * template for template, to what a ColumnsBuilder gives when the same points
 * are added in the same order (templates in order of first use, one shared
 * by all the ranges that have it). How a study's stored slices become its
 * answer (server/jobs/studies.ts), and how a slice is cut from a longer
 * computation.
 */
export function joinColumns(ranges: ColumnsRange[]): PointParts<Float64Array> {
  const total = ranges.reduce((sum, r) => sum + Math.max(0, r.to - r.from), 0)
  const templateOf = new Uint16Array(total)
  const rowOf = new Uint32Array(total)
  const templates: unknown[] = []
  const rows: number[] = []
  const slotsOf: number[] = []
  const byText = new Map<string, number>()
  /** For each joined template, the runs of rows it takes from the ranges, in order. */
  const runs: { column: ArrayLike<number>, stride: number, first: number, count: number }[][] = []
  let i = 0
  for (const { columns, from, to } of ranges) {
    if (from < 0 || to > columns.templateOf.length) throw new Error(`points ${from} to ${to} asked of columns of ${columns.templateOf.length} points`)
    const joinedOf = new Map<number, { t: number, run: { column: ArrayLike<number>, stride: number, first: number, count: number } }>()
    for (let k = from; k < to; k++) {
      const own = columns.templateOf[k]!
      let seen = joinedOf.get(own)
      if (!seen) {
        const text = JSON.stringify(columns.templates[own])
        let t = byText.get(text)
        if (t === undefined) {
          t = templates.length
          if (t === 0xffff) throw new Error('a sweep answer with more than 65535 shapes of point')
          byText.set(text, t)
          templates.push(columns.templates[own])
          rows.push(0)
          runs.push([])
          const stride = columns.rows[own]!
          slotsOf.push(stride ? columns.columns[own]!.length / stride : 0)
        }
        seen = { t, run: { column: columns.columns[own]!, stride: columns.rows[own]!, first: columns.rowOf[k]!, count: 0 } }
        runs[t]!.push(seen.run)
        joinedOf.set(own, seen)
      }
      const { t, run } = seen
      // A template's points take its rows in order, so those of a range are rows first…first+count.
      if (columns.rowOf[k] !== run.first + run.count) throw new Error('columns whose rows are not in the order of their points')
      run.count++
      templateOf[i] = t
      rowOf[i] = rows[t]!++
      i++
    }
  }
  const joined = runs.map((pieces, t) => {
    const n = rows[t]!
    const slots = slotsOf[t]!
    const column = new Float64Array(slots * n)
    for (let s = 0; s < slots; s++) {
      let at = s * n
      for (const { column: source, stride, first, count } of pieces) {
        const start = s * stride + first
        if (source instanceof Float64Array) column.set(source.subarray(start, start + count), at)
        else for (let r = 0; r < count; r++) column[at + r] = (source[start + r] as number | null) ?? Number.NaN
        at += count
      }
    }
    return column
  })
  return { templates, templateOf, rowOf, columns: joined, rows }
}

/** Points whose template says they did not converge. */
export function failedPoints(columns: PointColumns): number {
  const failed = columns.templates.map((template) => (template as { converged?: unknown } | null)?.converged === false)
  let n = 0
  for (let i = 0; i < columns.templateOf.length; i++) if (failed[columns.templateOf[i]!]) n++
  return n
}

/**
 * The JSON text of each point, written from its template and numbers
 * without making the Result: the same text as `JSON.stringify` of
 * `sweepPoint(columns, i)` (and so of the solver's point), character for
 * character.
 */
export function pointTexts(columns: PointColumns): string[] {
  const slotText = JSON.stringify(SLOT)
  const pieces = columns.templates.map((template) => JSON.stringify(template).split(slotText))
  const out: string[] = new Array(columns.templateOf.length)
  for (let i = 0; i < out.length; i++) {
    const t = columns.templateOf[i]!
    const parts = pieces[t]!
    const col = columns.columns[t]!
    const rows = columns.rows[t]!
    const r = columns.rowOf[i]!
    let text = parts[0]!
    for (let s = 1; s < parts.length; s++) text += JSON.stringify(toNumber(col[(s - 1) * rows + r] as number)) + parts[s]
    out[i] = text
  }
  return out
}
