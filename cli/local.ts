/**
 * The commands on local files: `check FILE… [--json]` prints diagnostics
 * (FILE:LINE:COL: severity CODE: message), `solve` is the solver's own
 * command (cli/solve.ts). Loaded only when one of them runs.
 */
import { existsSync, readFileSync } from 'node:fs'
import { compile } from '../shared/poise/index'
import { EXIT } from './exit-codes'
import { diagnosticLine } from './diagnostic-line'

export { runSolveCommand } from './solve'

export function check(files: string[], json: boolean): number {
  let worst: number = EXIT.ok
  const report: { file: string; diagnostics: unknown[] }[] = []
  for (const file of files) {
    if (!existsSync(file)) { console.error(`${file}: no such file`); worst = EXIT.badInput; continue }
    const result = compile(readFileSync(file, 'utf8'))
    if (result.diagnostics.some((d) => d.severity === 'error')) worst = EXIT.badInput
    if (json) report.push({ file, diagnostics: result.diagnostics })
    else for (const d of result.diagnostics) console.log(diagnosticLine(file, d))
  }
  if (json) console.log(JSON.stringify(files.length === 1 ? report[0] ?? {} : report, null, 2))
  return worst
}
