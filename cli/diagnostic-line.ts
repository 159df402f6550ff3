/**
 * The one line format of a diagnostic on the command line, as compilers and
 * editors read it: `FILE:LINE:COL: severity CODE: message`.
 */
import type { Diagnostic } from '../shared/poise/diagnostics'

export function diagnosticLine(file: string, d: Diagnostic): string {
  return `${file}:${d.range.line}:${d.range.column}: ${d.severity} ${d.code}: ${d.message}`
}
