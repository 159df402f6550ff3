/**
 * Live diagnostics: the shared compiler runs in the browser on every pause in
 * typing, so the editor shows exactly what the server would say, with no
 * round trip.
 */
import { linter, type Diagnostic as EditorDiagnostic } from '@codemirror/lint'
import type { Extension } from '@codemirror/state'
import type { EditorView } from '@codemirror/view'
import { compile } from '../shared/poise/index'
import { poiseSymbolsField, setPoiseSymbols } from './analysis'
import { toEditorDiagnostics } from './editorDiagnostics'
import { inlineMessages } from './inlineMessages'

export type PoiseCompileOptions = NonNullable<Parameters<typeof compile>[1]>
export type PoiseCompileResult = Awaited<ReturnType<typeof compile>>

export interface PoiseLinterOptions {
  /** Passed to compile(), e.g. how `use "LIBRARY"` is resolved. */
  compileOptions?: PoiseCompileOptions
  /** Called with each compile result, e.g. to show counts in a status line. */
  onResult?: (result: PoiseCompileResult) => void
  /** Pause after typing before compiling, ms. */
  delay?: number
}

/**
 * The Poise linter: compile on each pause, publish the symbols for completion
 * and hover, and show each message in the text under its line.
 */
export function poiseLinter(options: PoiseLinterOptions = {}): Extension {
  const source = async (view: EditorView): Promise<EditorDiagnostic[]> => {
    const doc = view.state.doc
    const result = await compile(doc.toString(), options.compileOptions)
    if (view.state.doc === doc) view.dispatch({ effects: setPoiseSymbols.of(result.symbols) })
    options.onResult?.(result)
    return toEditorDiagnostics(result.diagnostics, doc.length)
  }
  return [poiseSymbolsField, inlineMessages, linter(source, { delay: options.delay ?? 250 })]
}
