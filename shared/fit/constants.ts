/**
 * Where a reaction's constant is written in a Poise text (the fit reports
 * each reaction as written), and "use these values": the fitted value, its ±
 * and a citation of the data set written into the next revision.
 */
import { lexForParser } from '../poise/lexer'
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

/** A fitted constant to write back: its line, the value in its kind and its standard error (null: not determined, no ± written). */
export interface FittedValue { line: number; value: number; standardError: number | null }

/** What a fitted constant's citation says: the data set by name and SHA-256, so the revision shows where the value came from. */
export function fitCitation(dataset: { name: string; sha256: string }): string {
  const name = dataset.name.replace(/["\\\n\r]/g, "'")
  return `fitted to data set ${name} (sha256 ${dataset.sha256})`
}

/**
 * The text with each fitted constant's number, its ± (the standard error)
 * and its citation rewritten on its own line; `fit` and everything else on
 * the line stay. A constant the data did not determine keeps its number
 * and gets no ±. Null when a line holds no reaction constant.
 */
export function withFittedValues(source: string, fitted: FittedValue[], dataset: { name: string; sha256: string }): string | null {
  const cite = `cite "${fitCitation(dataset)}"`
  const edits: { from: number; to: number; text: string }[] = []
  const { tokens } = lexForParser(source)
  for (const f of fitted) {
    const onLine = tokens.filter((t) => t.startLine === f.line && t.tokenType.name !== 'Newline')
    const k = onLine.findIndex((t) => t.tokenType.name === 'ConstantKind')
    const number = onLine[k + 1]
    if (onLine[0]?.image !== 'reaction' || k < 1 || !number || number.tokenType.name !== 'Number') return null
    if (f.standardError === null) continue
    const shown = formatWithError(f.value, f.standardError)
    let end = number.startOffset + number.image.length
    const sign = onLine[k + 2]
    const spread = onLine[k + 3]
    if (sign?.tokenType.name === 'PlusMinus' && spread?.tokenType.name === 'Number') end = spread.startOffset + spread.image.length
    edits.push({ from: number.startOffset, to: end, text: `${shown.value} ± ${shown.error}` })
    const c = onLine.findIndex((t) => t.tokenType.name === 'CiteKeyword')
    const what = c >= 0 ? onLine[c + 1] : undefined
    if (c >= 0 && what && what.startLine === f.line) edits.push({ from: onLine[c]!.startOffset, to: what.startOffset + what.image.length, text: cite })
    else {
      const last = onLine[onLine.length - 1]!
      edits.push({ from: last.startOffset + last.image.length, to: last.startOffset + last.image.length, text: `  ${cite}` })
    }
  }
  edits.sort((a, b) => b.from - a.from)
  let out = source
  for (const e of edits) out = out.slice(0, e.from) + e.text + out.slice(e.to)
  return out
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
