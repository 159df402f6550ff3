/** Collects diagnostics with ranges computed from offsets, clamped to the document. */
import type { Diagnostic, Fix, Severity, SourceRange } from './diagnostics'

export class Reporter {
  readonly diagnostics: Diagnostic[] = []
  private readonly lineStarts: number[] = [0]

  constructor(private readonly text: string) {
    for (let i = 0; i < text.length; i++) {
      const ch = text.charCodeAt(i)
      if (ch === 10 || (ch === 13 && text.charCodeAt(i + 1) !== 10)) this.lineStarts.push(i + 1)
    }
  }

  /** 1-based line of an offset. */
  lineOf(offset: number): number {
    let lo = 0
    let hi = this.lineStarts.length - 1
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1
      if (this.lineStarts[mid]! <= offset) lo = mid
      else hi = mid - 1
    }
    return lo + 1
  }

  range(from: number, to: number): SourceRange {
    const f = Math.max(0, Math.min(this.text.length, Number.isFinite(from) ? from : 0))
    const t = Math.max(f, Math.min(this.text.length, Number.isFinite(to) ? to : f))
    const line = this.lineOf(f)
    const endLine = this.lineOf(t)
    return { from: f, to: t, line, column: f - this.lineStarts[line - 1]! + 1, endLine, endColumn: t - this.lineStarts[endLine - 1]! + 1 }
  }

  add(severity: Severity, code: string, message: string, from: number, to: number, fixes?: Fix[]): void {
    const d: Diagnostic = { severity, code, message, range: this.range(from, to) }
    if (fixes && fixes.length) d.fixes = fixes
    this.diagnostics.push(d)
  }

  error(code: string, message: string, at: { from: number; to: number }, fixes?: Fix[]): void {
    this.add('error', code, message, at.from, at.to, fixes)
  }

  warning(code: string, message: string, at: { from: number; to: number }): void {
    this.add('warning', code, message, at.from, at.to)
  }

  get hasErrors(): boolean {
    return this.diagnostics.some((d) => d.severity === 'error')
  }
}
