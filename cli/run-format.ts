/**
 * The tables of a stored run, as `solve` prints them for a local file: the
 * revision's text is compiled again (with the library revisions the run
 * used) for the names and units; the numbers are the run's own.
 */
import { compile, type Model } from '../shared/poise/index'
import type { AnswerKind, MapAnswer, Result, SweepResult, TitrationResult } from '../shared/types/result'
import { formatMapTable, formatResultTable, formatSweepTable, formatTitrationTable } from './tables'
import { OUTPUT_UNITS, parseOutputUnit, unitScale, type OutputUnit } from '../shared/results/units'
import { CliError, EXIT } from './exit-codes'

export function checkUnit(text: string | undefined): OutputUnit {
  if (text === undefined) return 'mol/L'
  const unit = parseOutputUnit(text)
  if (!unit) throw new CliError(EXIT.badInput, `--units takes one of ${OUTPUT_UNITS.join(', ')}, not ${text}`)
  return unit
}

export function formatRun(
  source: string,
  libraries: Map<string, { source: string, revision: number }>,
  run: { kind: AnswerKind, result: unknown, model?: Model | null },
  choice: { unit: OutputUnit, asElement: boolean },
): string {
  // The model stored with the run is what was solved; only a run stored before models were is recompiled.
  const model = run.model ?? compile(source, { resolveLibrary: (name) => libraries.get(name) ?? null }).model
  if (!model || run.result === null) return JSON.stringify(run.result, null, 2)
  const scale = unitScale(model, choice)
  if (run.kind === 'titration') return formatTitrationTable(model, run.result as TitrationResult)
  if (run.kind === 'map') return formatMapTable(model, run.result as MapAnswer, scale)
  return run.kind === 'sweep'
    ? formatSweepTable(model, run.result as SweepResult, scale)
    : formatResultTable(model, run.result as Result, scale)
}
