/**
 * What the last compile of the document found out, kept in the editor state
 * so completion and hover can use the species the file declares without
 * compiling again on every keystroke. The linter fills it.
 */
import { StateEffect, StateField } from '@codemirror/state'
import type { PoiseSymbol } from '../shared/poise/index'

export const setPoiseSymbols = StateEffect.define<readonly PoiseSymbol[]>()

export const poiseSymbolsField = StateField.define<readonly PoiseSymbol[]>({
  create: () => [],
  update(symbols, tr) {
    for (const effect of tr.effects) {
      if (effect.is(setPoiseSymbols)) return effect.value
    }
    return symbols
  },
})
