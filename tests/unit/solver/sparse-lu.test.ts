// The solver's sparse LU (server/solver/sparse-lu.ts) against a dense LU
// with partial pivoting (ml-matrix) on random systems: arrow-shaped like the
// solver's Jacobians, fully random, and ones that need row exchanges.
import { describe, expect, it } from 'vitest'
import { LuDecomposition, Matrix } from 'ml-matrix'
import { SparseLu } from '../../../server/solver/sparse-lu'

/** A small seeded generator (mulberry32), so a failure can be replayed. */
function rng(seed: number) {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

type Shape = 'arrow' | 'dense' | 'zero diagonal'

/** A random nonsingular-looking matrix of the given shape, as rows. */
function randomMatrix(n: number, shape: Shape, next: () => number): Float64Array[] {
  const rows = Array.from({ length: n }, () => new Float64Array(n))
  const hubs = Math.min(3, n)
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      const hub = r < hubs || c < hubs
      const fill = shape === 'dense' || (shape === 'arrow' ? hub || r === c || next() < 0.02 : r !== c && (hub || next() < 0.1))
      if (fill) rows[r][c] = (next() - 0.5) * (r === c && shape === 'arrow' ? 4 : 2)
    }
  }
  // Zero diagonal: a permutation of a diagonally dominant matrix, so it is regular but every pivot must come from another row.
  if (shape === 'zero diagonal') for (let r = 0; r < n; r++) rows[r][(r + 1) % n] = 5 + next()
  return rows
}

function denseSolve(rows: Float64Array[], b: Float64Array): Float64Array {
  const x = new LuDecomposition(new Matrix(rows.map(r => Array.from(r)))).solve(Matrix.columnVector(Array.from(b)))
  return Float64Array.from(x.getColumn(0))
}

function residual(rows: Float64Array[], x: Float64Array, b: Float64Array): number {
  let worst = 0
  for (let r = 0; r < rows.length; r++) {
    let s = -b[r]
    for (let c = 0; c < rows.length; c++) s += rows[r][c] * x[c]
    worst = Math.max(worst, Math.abs(s))
  }
  return worst
}

describe('the sparse LU', () => {
  const cases: [Shape, number][] = [['arrow', 4], ['arrow', 40], ['arrow', 260], ['dense', 12], ['dense', 60], ['zero diagonal', 30]]
  it.each(cases)('solves %s systems of %i unknowns as the dense LU does', (shape, n) => {
    const next = rng(n * 7919 + shape.length)
    for (let trial = 0; trial < 20; trial++) {
      const rows = randomMatrix(n, shape, next)
      const b = Float64Array.from({ length: n }, () => next() - 0.5)
      const dense = denseSolve(rows, b)
      const lu = new SparseLu()
      const factored = rows.map(r => Float64Array.from(r))
      lu.factor(factored, n)
      const x = new Float64Array(n)
      lu.solve(b, x)
      const size = Math.max(...dense.map(Math.abs), 1)
      let worst = 0
      for (let k = 0; k < n; k++) worst = Math.max(worst, Math.abs(x[k] - dense[k]) / size)
      expect(worst).toBeLessThan(1e-9)
      expect(residual(rows, x, b)).toBeLessThan(1e-10 * size * n)
      // One factorisation serves several right-hand sides (the chord step).
      const b2 = Float64Array.from({ length: n }, () => next())
      const x2 = new Float64Array(n)
      lu.solve(b2, x2)
      expect(residual(rows, x2, b2)).toBeLessThan(1e-10 * Math.max(...Array.from(x2, Math.abs), 1) * n)
    }
  })

  it('reports a zero pivot for a singular matrix (a repeated row, an empty column)', () => {
    const next = rng(5)
    const rows = randomMatrix(20, 'arrow', next)
    rows[7] = Float64Array.from(rows[3])
    const lu = new SparseLu()
    lu.factor(rows.map(r => Float64Array.from(r)), 20)
    const { smallest, largest } = lu.pivotRange()
    expect(smallest).toBeLessThan(largest * 1e-13)
    const empty = randomMatrix(10, 'dense', next)
    for (const r of empty) r[4] = 0
    lu.factor(empty, 10)
    expect(lu.pivotRange().smallest).toBe(0)
  })
})
