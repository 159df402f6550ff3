/**
 * The Poise language: one entry point for the editor, the server, the CLI and
 * the tests. `compile` never throws: an internal bug becomes a diagnostic.
 */
import type { Diagnostic } from './diagnostics'
import { compileSource, type CompileOptions, type CompileResult, type PoiseSymbol } from './compile'
import { lexForParser } from './lexer'

export type { CompileOptions, CompileResult, PoiseSymbol }
export type * from './model'
export type * from './diagnostics'
export { formatSpecies, formatCharge, parseFormula, type ParsedFormula, type FormulaProblem } from './formula'
export { ATOMIC_WEIGHTS, molarMassOf } from './elements'
export { KEYWORDS, UNITS, CONSTANT_KINDS } from './tokens'
export { lex } from './lexer'
export { vantHoff, GAS_CONSTANT } from './thermo'
export { COMPILER_VERSION } from './version'

export function compile(source: string, options: CompileOptions = {}): CompileResult {
  try {
    const { model, diagnostics, symbols } = compileSource(String(source ?? ''), options)
    return { model, diagnostics, symbols }
  } catch (e) {
    const internal: Diagnostic = {
      severity: 'error', code: 'P999',
      message: `internal error in the Poise compiler (please report it with this file): ${e instanceof Error ? e.message : String(e)}`,
      range: { from: 0, to: 0, line: 1, column: 1, endLine: 1, endColumn: 1 },
    }
    return { model: null, diagnostics: [internal], symbols: [] }
  }
}

/** The `use` statements of a file, so a caller can load the libraries before compiling. */
export function findUses(source: string): { name: string; revision: number | null; line: number }[] {
  try {
    const { tokens } = lexForParser(source)
    const out: { name: string; revision: number | null; line: number }[] = []
    for (let i = 0; i < tokens.length; i++) {
      const t = tokens[i]!
      const prev = tokens[i - 1]
      if (t.tokenType.name !== 'UseKeyword' || (prev && prev.tokenType.name !== 'Newline')) continue
      const name = tokens[i + 1]
      if (!name || name.tokenType.name !== 'String') continue
      const at = tokens[i + 2]
      const rev = at?.tokenType.name === 'At' ? tokens[i + 3] : undefined
      const revision = rev?.tokenType.name === 'Number' && /^\d+$/.test(rev.image) ? Number(rev.image) : null
      out.push({ name: name.image.slice(1, -1).replace(/\\(.)/g, '$1'), revision, line: t.startLine ?? 1 })
    }
    return out
  } catch {
    return []
  }
}
