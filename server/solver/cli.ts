/**
 * `npm run -s cli -- solve FILE.poise [--json]`, called by scripts/cli.ts.
 * Exit codes: 0 solved, 1 a solve (or a sweep point) did not converge,
 * 2 the file could not be read or compiled (diagnostics on stderr).
 */
import { existsSync, readFileSync } from 'node:fs'
import { compile } from '../../shared/poise/index'
import type { Result, SweepResult } from '../../shared/types/result'
import { solve, sweep } from './index'
import { formatResultTable, formatSweepTable } from './table'

const USAGE = 'usage: npm run -s cli -- solve FILE.poise [--json]'

export async function runSolveCommand(args: string[]): Promise<number> {
  const json = args.includes('--json')
  const files = args.filter((a) => a !== '--json')
  if (files.length !== 1) {
    console.error(`solve takes exactly one file.\n${USAGE}`)
    return 2
  }
  const file = files[0]
  if (!existsSync(file)) {
    console.error(`${file}: no such file`)
    return 2
  }
  const compiled = compile(readFileSync(file, 'utf8'))
  for (const d of compiled.diagnostics) {
    console.error(`${file}:${d.range.line}:${d.range.column}: ${d.severity} ${d.code}: ${d.message}`)
  }
  const model = compiled.model
  if (!model || compiled.diagnostics.some((d) => d.severity === 'error')) return 2
  if (model.sweep) {
    const out: SweepResult = sweep(model)
    console.log(json ? JSON.stringify(out, null, 2) : formatSweepTable(model, out))
    return out.points.every((p) => p.converged) ? 0 : 1
  }
  const result: Result = solve(model)
  console.log(json ? JSON.stringify(result, null, 2) : formatResultTable(model, result))
  return result.converged ? 0 : 1
}
