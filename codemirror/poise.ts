/**
 * The Poise language package for CodeMirror, in the shape of CodeMirror's own
 * language packages: the language, a `poise()` support bundle (highlighting,
 * completion, hover) and a linter that runs the shared compiler.
 */
import { LanguageSupport, syntaxHighlighting } from '@codemirror/language'
import { poiseSymbolsField } from './analysis'
import { poiseCompletionSource } from './completion'
import { poiseHover } from './hover'
import { poiseLanguage } from './language'
import { poiseHighlightStyle } from './theme'

export { poiseLanguage } from './language'
export { toEditorDiagnostics } from './editorDiagnostics'
export { poiseLinter, type PoiseLinterOptions, type PoiseCompileOptions, type PoiseCompileResult } from './lint'
export { poiseHighlightStyle, poiseEditorTheme } from './theme'
export { RUN_KEY, SAVE_KEY, REFERENCE_KEY, shortcutLabel } from './shortcuts'
export { statementAt, referenceAt, poiseReference } from './reference'

/** Poise with highlighting, completion of keywords, units, constant kinds and declared species, and hover (the editor adds `poiseReference()`: the reference key and link). */
export function poise(): LanguageSupport {
  return new LanguageSupport(poiseLanguage, [
    poiseLanguage.data.of({ autocomplete: poiseCompletionSource }),
    syntaxHighlighting(poiseHighlightStyle),
    poiseSymbolsField,
    poiseHover,
  ])
}
