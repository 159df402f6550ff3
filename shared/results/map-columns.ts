/**
 * Reading a map answer (MapAnswer, by columns): the Result of one cell made
 * on demand, one quantity over the whole grid, the contract shape `solve
 * --json` prints, and the answer's JSON (typed-array columns as arrays).
 */
import type { MapAnswer, MapResult, Result } from '../types/result'
import { sweepPoint, sweepQuantity } from './sweep-columns'

/** The Result of the cell at row i (y.values[i]) and column j (x.values[j]). */
export function mapCell(answer: MapAnswer, i: number, j: number): Result {
  return sweepPoint(answer.cells, i * answer.x.values.length + j)
}

/**
 * One quantity over the grid, row after row (cell k is row ⌊k / nx⌋, column
 * k mod nx), by path into a cell as `sweepQuantity` takes it: `['pH']`,
 * `['species', 'Cu^2+', 'log10']`. NaN where a cell lacks it or holds null.
 */
export function mapQuantity(answer: MapAnswer, path: (string | number)[]): Float64Array {
  return sweepQuantity(answer.cells, path)
}

/** Every cell as a Result, rows by y: the shape `solve --json` prints. */
export function toMapResult(answer: MapAnswer): MapResult {
  const nx = answer.x.values.length
  return {
    x: answer.x,
    y: answer.y,
    points: answer.y.values.map((_y, i) => Array.from({ length: nx }, (_x, j) => mapCell(answer, i, j))),
  }
}

/** The answer as JSON: typed-array columns written as arrays of numbers. */
export function mapAnswerJson(answer: MapAnswer): string {
  return JSON.stringify(answer, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v))
}
