/**
 * Where a reaction's constant is written in a Poise text, and writing a new
 * one there: the fit reads each fitted constant's number from the text and
 * moves it (fit.ts in server/solver), and "use these values" writes the
 * fitted value, its ± and a citation of the data set into the next revision.
 */
import { lexForParser } from '../poise/lexer'
import { constantFromLogK } from '../poise/reactions'
import type { ConstantKind } from '../poise/model'

export interface ConstantSpan {
  /** The reaction as written between `reaction` and its kind, spaces collapsed: `HA <=> A- + H+`. */
  reaction: string
  kind: ConstantKind
  /** Offsets of the number after the kind. */
  from: number
  to: number
  /** Offsets of the rest of the statement after the number, up to the end of the line (± and its number, `fit`, `cite …`, `dH …`). */
  lineEnd: number
}

/** The constant of the `reaction` statement on a 1-based line; null when that line holds none. */
export function constantSpan(source: string, line: number): ConstantSpan | null {
  const { tokens } = lexForParser(source)
  const onLine = tokens.filter((t) => t.startLine === line && t.tokenType.name !== 'Newline')
  const first = onLine[0]
  if (!first || first.image !== 'reaction') return null
  const k = onLine.findIndex((t) => t.tokenType.name === 'ConstantKind')
  const number = onLine[k + 1]
  if (k < 1 || !number || number.tokenType.name !== 'Number') return null
  const lineBreak = source.indexOf('\n', number.startOffset)
  return {
    reaction: source.slice(first.startOffset + first.image.length, onLine[k]!.startOffset).trim().replace(/\s+/g, ' '),
    kind: onLine[k]!.image as ConstantKind,
    from: number.startOffset,
    to: number.startOffset + number.image.length,
    lineEnd: lineBreak < 0 ? source.length : lineBreak,
  }
}

/** The text with the constant on `line` set to log10 K = logK (written in the line's own kind). Null when the line holds no constant. */
export function withConstant(source: string, line: number, logK: number): string | null {
  const span = constantSpan(source, line)
  if (!span) return null
  const { value } = constantFromLogK(span.kind, logK)
  return source.slice(0, span.from) + String(value) + source.slice(span.to)
}

/**
 * A value and its standard error as a person writes them: the error to two
 * significant digits, the value to the same last decimal (4.7034 ± 0.0123 →
 * 4.703 ± 0.012); in exponent form for numbers below 1e-3 or from 1e6.
 */
export function formatWithError(value: number, error: number | null): { value: string; error: string | null } {
  if (error === null || !(error > 0) || !Number.isFinite(error)) return { value: String(Number(value.toPrecision(6))), error: null }
  const a = Math.abs(value)
  if (a !== 0 && (a < 1e-3 || a >= 1e6)) {
    const exponent = Math.floor(Math.log10(a))
    const digits = Math.max(1, Math.min(15, exponent - Math.floor(Math.log10(error)) + 2))
    return { value: value.toExponential(digits - 1), error: error.toExponential(1) }
  }
  const decimals = Math.max(0, Math.min(12, 1 - Math.floor(Math.log10(error))))
  return { value: value.toFixed(decimals), error: error.toFixed(decimals) }
}
