/**
 * Live diagnostics: the shared compiler runs in the browser on every pause in
 * typing, so the editor shows exactly what the server would say, with no
 * round trip.
 */
import { linter, type Diagnostic as EditorDiagnostic } from '@codemirror/lint'
import type { Extension } from '@codemirror/state'
import type { EditorView } from '@codemirror/view'
import { compile, type CompileOptions, type CompileResult } from '../shared/poise/index'
import { poiseSymbolsField, setPoiseSymbols } from './analysis'
import { toEditorDiagnostics } from './editorDiagnostics'
import { inlineMessages } from './inlineMessages'

export type { CompileOptions as PoiseCompileOptions, CompileResult as PoiseCompileResult }

export interface PoiseLinterOptions {
  /** Passed to compile(), e.g. how `use "LIBRARY"` is resolved. */
  compileOptions?: CompileOptions
  /** Called with each compile result, e.g. to show counts in a status line. */
  onResult?: (result: CompileResult) => void
  /** Pause after typing before compiling, ms. */
  delay?: number
}

/**
 * The Poise linter: compile on each pause, publish the symbols for completion
 * and hover, and show each message in the text under its line.
 */
export function poiseLinter(options: PoiseLinterOptions = {}): Extension {
  const source = (view: EditorView): EditorDiagnostic[] => {
    const doc = view.state.doc
    const result = compile(doc.toString(), options.compileOptions)
    view.dispatch({ effects: setPoiseSymbols.of(result.symbols) })
    options.onResult?.(result)
    return toEditorDiagnostics(result.diagnostics, doc.length)
  }
  return [poiseSymbolsField, inlineMessages, linter(source, { delay: options.delay ?? 250 })]
}
