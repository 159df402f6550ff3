/**
 * The answer of a fit (server/solver/fit.ts), as the API, the CLI's --json
 * and the workbench read it. The CLI contract's keys — converged,
 * iterations, points, degreesOfFreedom, residualStandardDeviation,
 * constants [{ reaction, kind, value, standardError }], correlation — are
 * never renamed.
 */
import type { ConstantKind } from '../poise/model'

export interface FittedConstant {
  /** The reaction as written in the file (spaces collapsed). */
  reaction: string
  kind: ConstantKind
  /** In the constant's own kind (pKa, logK, K…). */
  value: number
  /** In the same kind; null when the data do not determine it. */
  standardError: number | null
  /** The value the file gave, in the kind. */
  initial: number
  logK: number
  logKStandardError: number | null
  /** The species (solid, gas) the reaction defines. */
  defines: string
  line: number
}

export interface FitColumn {
  header: string
  weight: number
  measured: (number | null)[]
  /** The model at the fitted constants, at each row; null where it could not be read. */
  fitted: (number | null)[]
  /** fitted − measured, unweighted; null where either is missing. */
  residual: (number | null)[]
}

export interface FitResult {
  converged: boolean
  iterations: number
  /** Measured values fitted (non-empty cells). */
  points: number
  degreesOfFreedom: number
  /** s = √(Σ(w·r)² / dof), in the weighted units of the columns. */
  residualStandardDeviation: number
  constants: FittedConstant[]
  correlation: number[][]
  /** Correlations beyond CORRELATION_WARNING and constants the data do not determine, in words. */
  warnings: string[]
  /** Why it did not converge. */
  reason?: string
  variable: { header: string; values: number[] }
  columns: FitColumn[]
  /** The model at the fitted constants on a fine grid of the variable, per measured column. */
  curve: { values: number[]; columns: { header: string; values: (number | null)[] }[] }
}

export type FitOutcome = { ok: true; fit: FitResult } | { ok: false; message: string }

