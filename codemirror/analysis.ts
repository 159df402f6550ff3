/**
 * What the last compile of the document found out, kept in the editor state
 * so completion and hover can use the species the file declares without
 * compiling again on every keystroke. The linter fills it.
 */
import { StateEffect, StateField } from '@codemirror/state'
import type { PoiseSymbol } from '../shared/poise/index'
import type { Abbreviations } from '../shared/poise/formula'

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

/** The file's abbreviations as the formula reader takes them, from the last compile's symbols (memoised per symbol list). */
const tables = new WeakMap<readonly PoiseSymbol[], Abbreviations>()
export function abbreviationsOf(symbols: readonly PoiseSymbol[]): Abbreviations {
  let table = tables.get(symbols)
  if (!table) {
    table = new Map(symbols.filter((s) => s.kind === 'abbreviation').map((s) => [s.name, { name: s.name, formula: s.stands ?? '', elements: s.elements, from: s.definedAt.from }]))
    tables.set(symbols, table)
  }
  return table
}
