/**
 * `npm run -s cli -- solve FILE.poise [--json] [--units UNIT] [--as-element]`,
 * called by cli/local.ts (the solver runs here, in this process). `--units` (mol/L, mmol/L, µmol/L or umol/L,
 * mg/L, µg/L or ug/L) sets the unit of the tables; `--as-element` counts
 * components in a mass unit as their element (Ni as Ni, NH3 as N). The JSON
 * is the Result as the solver wrote it, always in mol/L; for a titration
 * it is the TitrationResult (volumes in mL); for a map, `{ x, y, points }`
 * with one row of Results per y value (MapResult).
 * Exit codes: 0 solved, 1 a solve (or a sweep point) did not converge,
 * 2 the file could not be read or compiled (diagnostics on stderr).
 */
import { existsSync, readFileSync } from 'node:fs'
import { compile } from '../shared/poise/index'
import type { Result, SweepResult } from '../shared/types/result'
import { SOLVER_LIMITS, solve, solveMap, sweep, titration } from '../server/solver/index'
import { toMapResult } from '../shared/results/map-columns'
import { formatMapTable, formatResultTable, formatSweepTable, formatTitrationTable } from './tables'
import { diagnosticLine } from './diagnostic-line'
import { OUTPUT_UNITS, parseOutputUnit, unitScale } from '../shared/results/units'

const USAGE = 'usage: npm run -s cli -- solve FILE.poise [--json] [--units UNIT] [--as-element]'

export async function runSolveCommand(args: string[]): Promise<number> {
  const json = args.includes('--json')
  const asElement = args.includes('--as-element')
  const rest = args.filter((a) => a !== '--json' && a !== '--as-element')
  const at = rest.indexOf('--units')
  let unitText: string | null = null
  if (at >= 0) {
    unitText = rest[at + 1] ?? ''
    rest.splice(at, 2)
  }
  const unit = unitText === null ? 'mol/L' : parseOutputUnit(unitText)
  if (unit === null) {
    console.error(`--units takes one of ${OUTPUT_UNITS.join(', ')}${unitText ? `, not ${unitText}` : ''}.\n${USAGE}`)
    return 2
  }
  const files = rest
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
    console.error(diagnosticLine(file, d))
  }
  const model = compiled.model
  if (!model || compiled.diagnostics.some((d) => d.severity === 'error')) return 2
  if (model.map) {
    const out = solveMap(model, { timeBudgetMs: SOLVER_LIMITS.timeBudgetMs })
    console.log(json ? JSON.stringify(toMapResult(out), null, 2) : formatMapTable(model, out))
    return out.failedCells === 0 ? 0 : 1
  }
  if (model.titration) {
    const out = titration(model)
    console.log(json ? JSON.stringify(out, null, 2) : formatTitrationTable(model, out))
    return 'points' in out ? (out.points.every((p) => p.converged) ? 0 : 1) : out.volume !== null || out.reason?.includes('not reachable') ? 0 : 1
  }
  if (model.sweep) {
    const out: SweepResult = sweep(model)
    console.log(json ? JSON.stringify(out, null, 2) : formatSweepTable(model, out, unitScale(model, { unit, asElement })))
    return out.points.every((p) => p.converged) ? 0 : 1
  }
  const result: Result = solve(model)
  console.log(json ? JSON.stringify(result, null, 2) : formatResultTable(model, result, unitScale(model, { unit, asElement })))
  return result.converged ? 0 : 1
}
