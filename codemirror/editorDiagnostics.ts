/**
 * Compiler diagnostics as CodeMirror diagnostics. Ranges are clamped to the
 * document (the compiler may point just past the end, e.g. at a missing last
 * line), severities mapped, and each fix offered as a lint action.
 */
import type { Action, Diagnostic as EditorDiagnostic } from '@codemirror/lint'
import type { EditorView } from '@codemirror/view'
import type { Diagnostic, Fix } from '../shared/poise/diagnostics'

const clamp = (value: number, min: number, max: number) => Math.min(Math.max(value, min), max)

function fixAction(fix: Fix, diagnosticFrom: number): Action {
  // Fixes are written against the text that was compiled; keep them at the
  // same distance from the diagnostic, which the editor maps through edits.
  const offset = fix.from - diagnosticFrom
  const length = fix.to - fix.from
  return {
    name: fix.label,
    apply(view: EditorView, from: number) {
      const docLength = view.state.doc.length
      const start = clamp(from + offset, 0, docLength)
      const end = clamp(start + length, start, docLength)
      view.dispatch({ changes: { from: start, to: end, insert: fix.insert }, selection: { anchor: start + fix.insert.length } })
    },
  }
}

/** Compiler diagnostics as CodeMirror diagnostics, every position inside a document of `docLength`. */
export function toEditorDiagnostics(diagnostics: readonly Diagnostic[], docLength: number): EditorDiagnostic[] {
  return diagnostics.map((d) => {
    const from = clamp(d.range.from, 0, docLength)
    const to = clamp(d.range.to, from, docLength)
    return {
      from,
      to,
      severity: d.severity === 'error' ? 'error' : d.severity === 'warning' ? 'warning' : 'info',
      source: d.code,
      message: d.message,
      actions: (d.fixes ?? []).map((fix) => fixAction(fix, from)),
    }
  })
}
