import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { compile, type CompileOptions } from '../../../shared/poise/index'

export const examplesDir = fileURLToPath(new URL('../../../examples/', import.meta.url))

export function exampleFiles(): { name: string; text: string }[] {
  return readdirSync(examplesDir).filter((f) => f.endsWith('.poise')).sort().map((name) => ({ name, text: readFileSync(examplesDir + name, 'utf8') }))
}

export function codes(source: string, options?: CompileOptions): string[] {
  return compile(source, options).diagnostics.map((d) => d.code)
}

/** A small correct file: no diagnostics at all. */
export const CLEAN = `system "Clean test system"
component H+ balance
component Cu^2+ total 1 mmol/L
component Cl- total 2 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 dH 55.84 kJ/mol cite "water (from memory)"
reaction Cu^2+ + H2O <=> CuOH+ + H+ logK -7.95 cite "hydrolysis (from memory)"
reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH- pKsp 19.66 cite "solubility (from memory)"
`
