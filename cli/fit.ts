/**
 * `fit FILE.poise DATA.csv [--json] [--weight COLUMN=W]…`: fits the
 * constants FILE marks `fit` to the measurements in DATA (server/solver/fit.ts)
 * and prints each with its standard error, the correlations and the
 * residual standard deviation. --json prints the FitResult
 * ({ converged, iterations, points, degreesOfFreedom,
 * residualStandardDeviation, constants: [{ reaction, kind, value,
 * standardError }], correlation, … }).
 * Exit 0 converged, 1 not converged, 2 a missing file, a model with errors,
 * a data set with problems (DATA:LINE:COLUMN: on stderr) or nothing to fit.
 */
import { existsSync, readFileSync } from 'node:fs'
import { compile } from '../shared/poise/index'
import { parseDataSet } from '../shared/fit/dataset'
import { formatWithError } from '../shared/fit/constants'
import { fitConstants } from '../server/solver/fit'
import type { FitResult } from '../shared/types/fit'
import { EXIT } from './exit-codes'
import { diagnosticLine } from './diagnostic-line'

export function runFit(file: string, dataFile: string, options: { json: boolean; weights: string[] }): number {
  for (const f of [file, dataFile]) {
    if (!existsSync(f)) { console.error(`${f}: no such file`); return EXIT.badInput }
  }
  const weights: Record<string, number> = {}
  for (const w of options.weights) {
    const at = w.lastIndexOf('=')
    const value = Number(w.slice(at + 1))
    if (at < 1 || !(value > 0) || !Number.isFinite(value)) { console.error(`--weight takes COLUMN=NUMBER with a number above 0, as in --weight "pH=2", not ${w}`); return EXIT.badInput }
    weights[w.slice(0, at).trim()] = value
  }
  const source = readFileSync(file, 'utf8')
  const compiled = compile(source)
  const errors = compiled.diagnostics.filter((d) => d.severity === 'error')
  for (const d of errors) console.error(diagnosticLine(file, d))
  if (errors.length || !compiled.model) return EXIT.badInput
  const parsed = parseDataSet(readFileSync(dataFile, 'utf8'))
  if (!parsed.ok) {
    for (const p of parsed.problems) console.error(`${dataFile}:${p.line}:${p.column ?? 1}: error: ${p.message}`)
    return EXIT.badInput
  }
  const unknown = Object.keys(weights).filter((h) => !parsed.data.headers.slice(1).includes(h))
  if (unknown.length) { console.error(`--weight names ${unknown.join(', ')}, not a measured column of ${dataFile} (${parsed.data.headers.slice(1).join(', ')})`); return EXIT.badInput }
  const outcome = fitConstants(source, parsed.data, { weights })
  if (!outcome.ok) { console.error(outcome.message); return EXIT.badInput }
  const fit = outcome.fit
  console.log(options.json ? JSON.stringify(fit, null, 2) : fitTable(fit))
  return fit.converged ? EXIT.ok : EXIT.failed
}

/** The fit as a person reads it in a terminal. */
export function fitTable(fit: FitResult): string {
  const lines: string[] = []
  const p = fit.constants.length
  lines.push(`${fit.converged ? 'Converged' : 'NOT converged'} after ${fit.iterations} iteration${fit.iterations === 1 ? '' : 's'}: ${p} constant${p === 1 ? '' : 's'} fitted to ${fit.points} measured values (${fit.degreesOfFreedom} degrees of freedom).`)
  if (fit.reason) lines.push(fit.reason)
  lines.push('')
  const rows = fit.constants.map((c, k) => {
    const shown = formatWithError(c.value, c.standardError)
    return [`${k + 1}`, c.reaction, c.kind, shown.value, shown.error === null ? 'not determined' : `± ${shown.error}`, String(c.initial)]
  })
  const header = ['#', 'reaction', 'kind', 'fitted', 'standard error', 'as written']
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)))
  const line = (cells: string[]) => cells.map((c, i) => (i >= 3 ? c.padStart(widths[i]!) : c.padEnd(widths[i]!))).join('  ').trimEnd()
  lines.push(line(header), ...rows.map(line), '')
  lines.push(`Residual standard deviation s = ${Number(fit.residualStandardDeviation.toPrecision(4))} (in the columns' own units${fit.columns.some((c) => c.weight !== 1) ? ', weighted' : ''}).`)
  if (p > 1) {
    lines.push('', 'Correlation:')
    fit.correlation.forEach((row, a) => lines.push(`  ${String(a + 1).padStart(2)}  ${row.map((r) => r.toFixed(3).padStart(7)).join(' ')}`))
  }
  for (const w of fit.warnings) lines.push('', `Warning: ${w}`)
  return lines.join('\n')
}
