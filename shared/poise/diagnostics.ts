/**
 * Diagnostics: what the checker tells the chemist. Every one has a stable
 * code (documented in grammar/), a message that says what to change, and a
 * range inside the document.
 */

export type Severity = 'error' | 'warning'

export interface SourceRange {
  /** 0-based offsets into the source, `to` exclusive. */
  from: number
  to: number
  /** 1-based line and column of `from`. */
  line: number
  column: number
  /** 1-based line and column of `to`. */
  endLine: number
  endColumn: number
}

/** A text edit that repairs the problem, offered in the editor as a quick fix. */
export interface Fix {
  label: string
  from: number
  to: number
  insert: string
}

export interface Diagnostic {
  severity: Severity
  code: string
  message: string
  range: SourceRange
  fixes?: Fix[]
}
