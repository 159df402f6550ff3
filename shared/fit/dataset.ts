/**
 * Data sets: a CSV of measurements for fitting constants. The first column is
 * the study variable — the added volume of a titration (`volume mL`,
 * `volume L`) or a sweep variable (`pH`, `total Cu^2+ mol/L`) — and each
 * further column a measured quantity: `pH`, a species concentration
 * (`Cu^2+ mol/L`, `Cu^2+ mg/L`), its log10 in mol/L (`log Cu^2+`), or a
 * dissolved total of an element or component (`dissolved Cu mg/L`).
 *
 * Parsed with papaparse; units read from the language's unit table
 * (shared/poise/units.ts). Every problem names its line and column and says
 * what to write; a file with any problem gives no data set. Whether the
 * model can predict a column is decided later, against a model (fit.ts).
 */
import Papa from 'papaparse'
import { unitInfo } from '../poise/units'
import { parseFormula } from '../poise/formula'
import { isElement } from '../poise/elements'
import { formatNumber, MAX_DATASET_COLUMNS, MAX_DATASET_ROWS } from '../poise/limits'

/** What the first column varies. Values are kept as written, in `unit`. */
export type StudyColumn =
  | { kind: 'volume'; unit: string }
  | { kind: 'pH' }
  | { kind: 'total'; component: string; unit: string }

/** A measured quantity. Values as written, in `unit` (pH units and log10 mol/L for `pH` and `log`). */
export type MeasuredColumn =
  | { kind: 'pH' }
  | { kind: 'species'; species: string; unit: string }
  | { kind: 'log'; species: string }
  | { kind: 'dissolved'; target: string; unit: string }

export interface DataSet {
  /** The headers as written (trimmed). */
  headers: string[]
  study: StudyColumn
  measured: MeasuredColumn[]
  /** rows[i][0] is the study variable, rows[i][k] the measured column k−1; null where a cell is empty. */
  rows: (number | null)[][]
}

export interface DataSetProblem {
  /** 1-based line of the file (the header is line 1). */
  line: number
  /** 1-based column; null for the whole file. */
  column: number | null
  message: string
}

export type DataSetParse = { ok: true; data: DataSet } | { ok: false; problems: DataSetProblem[] }

/** At most this many problems are listed for one file. */
const MAX_PROBLEMS = 20

const CONCENTRATION_UNITS = 'a concentration unit such as mol/L, mmol/L or mg/L'
export const HEADER_HELP = 'The first column is the study variable (`volume mL`, `volume L`, `pH` or `total Cu^2+ mol/L`); each further column a measurement (`pH`, `Cu^2+ mol/L`, `log Cu^2+` or `dissolved Cu mg/L`).'

function concentrationUnit(word: string | undefined): string | null {
  if (!word) return null
  const info = unitInfo(word)
  return info && (info.dimension === 'concentration' || info.dimension === 'mass-concentration') ? word : null
}

/**
 * A species or component as the language writes it, in caret form; a name
 * the file may define with `abbreviation` (NiCit-) is kept as written, and
 * the fit checks it against the model. Null when the text is not a name.
 */
function formulaName(text: string | undefined): string | null {
  if (!text) return null
  const f = parseFormula(text)
  if (f.formula && !f.problem) return f.formula.name
  return /^[A-Z][A-Za-z0-9()[\]]*(\^?\d*[+-])?(\((aq|s|g)\))?$/.test(text) ? text : null
}

/** Reads the first column's header; a string is the problem. */
export function readStudyHeader(header: string): StudyColumn | string {
  const words = header.trim().split(/\s+/)
  const [first, ...rest] = words
  if (first === 'pH' && rest.length === 0) return { kind: 'pH' }
  if (first === 'volume') {
    const info = rest.length === 1 ? unitInfo(rest[0]!) : null
    if (!info || info.dimension !== 'volume') return `"${header}" is not a study variable: write \`volume mL\` or \`volume L\` for the added volume of a titration`
    return { kind: 'volume', unit: rest[0]! }
  }
  if (first === 'total') {
    const component = formulaName(rest[0])
    const unit = concentrationUnit(rest[1])
    if (!component || !unit || rest.length !== 2) return `"${header}" is not a study variable: write \`total\`, a component and ${CONCENTRATION_UNITS}, as in \`total Cu^2+ mol/L\``
    return { kind: 'total', component, unit }
  }
  return `"${header}" is not a study variable. ${HEADER_HELP}`
}

/** Reads a measured column's header; a string is the problem. */
export function readMeasuredHeader(header: string): MeasuredColumn | string {
  const words = header.trim().split(/\s+/)
  const [first, ...rest] = words
  if (first === 'pH' && rest.length === 0) return { kind: 'pH' }
  if (first === 'log') {
    const species = formulaName(rest[0])
    if (!species || rest.length !== 1) return `"${header}" is not a measurement: write \`log\` and a species, as in \`log Cu^2+\` (log10 of its concentration in mol/L)`
    return { kind: 'log', species }
  }
  if (first === 'dissolved') {
    const what = rest[0]
    const target = what && isElement(what) ? what : formulaName(what)
    const unit = concentrationUnit(rest[1])
    if (!target || !unit || rest.length !== 2) return `"${header}" is not a measurement: write \`dissolved\`, an element or component and ${CONCENTRATION_UNITS}, as in \`dissolved Cu mg/L\``
    return { kind: 'dissolved', target, unit }
  }
  const species = formulaName(first)
  const unit = concentrationUnit(rest[0])
  if (species && unit && rest.length === 1) return { kind: 'species', species, unit }
  if (species && rest.length === 1) return `"${header}": ${rest[0]} is not ${CONCENTRATION_UNITS}`
  return `"${header}" is not a measurement. ${HEADER_HELP}`
}

/** A cell as a number: plain decimals and exponents only. */
function readNumber(cell: string): number | null | 'bad' {
  const t = cell.trim()
  if (t === '') return null
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return 'bad'
  const x = Number(t)
  return Number.isFinite(x) ? x : 'bad'
}

/** The number a cell should have been, in words, for the message. */
function cellAdvice(cell: string): string {
  if (/^\s*[+-]?\d+,\d+\s*$/.test(cell)) return `write ${cell.trim().replace(',', '.')} (a point, not a comma, before the decimals)`
  return 'write a number such as 0.5 or 1.2e-3'
}

/** Parses the text of a CSV data set. Never throws. */
export function parseDataSet(text: string): DataSetParse {
  const problems: DataSetProblem[] = []
  const add = (line: number, column: number | null, message: string) => { if (problems.length < MAX_PROBLEMS) problems.push({ line, column, message }) }
  const clean = String(text ?? '').replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n')
  // The header decides the separator (headers hold no ; or tab), so a decimal comma in the data cannot mislead a guess.
  const headerLine = clean.split('\n').find((l) => l.trim() !== '') ?? ''
  const delimiter = headerLine.includes(';') ? ';' : headerLine.includes('\t') ? '\t' : ','
  const parsed = Papa.parse<string[]>(clean, { skipEmptyLines: false, delimiter })
  // Rows keep their line: papaparse gives one row per line (measurements hold no quoted line breaks).
  const lines = parsed.data.map((cells, i) => ({ line: i + 1, cells })).filter((r) => !r.cells.every((c) => c.trim() === ''))
  for (const e of parsed.errors) {
    if (e.code === 'UndetectableDelimiter') continue
    add((e.row ?? 0) + 1, null, `${e.message}: check the quotes on this line`)
  }
  if (lines.length === 0) return { ok: false, problems: [{ line: 1, column: null, message: `The file is empty. ${HEADER_HELP}` }] }
  const head = lines[0]!
  const headers = head.cells.map((h) => h.trim())
  if (headers.length < 2) {
    add(head.line, null, `A data set needs the study variable and at least one measured column, separated by commas. ${HEADER_HELP}`)
    return { ok: false, problems }
  }
  if (headers.length > MAX_DATASET_COLUMNS) {
    add(head.line, MAX_DATASET_COLUMNS + 1, `A data set may have at most ${MAX_DATASET_COLUMNS} columns; this one has ${headers.length}. Split it into several data sets`)
    return { ok: false, problems }
  }
  const study = readStudyHeader(headers[0]!)
  if (typeof study === 'string') add(head.line, 1, study)
  const measured: MeasuredColumn[] = []
  const seen = new Map<string, number>()
  headers.slice(1).forEach((h, k) => {
    const column = k + 2
    const prior = seen.get(h)
    if (prior !== undefined) { add(head.line, column, `"${h}" is column ${prior} already: keep one of the two`); return }
    seen.set(h, column)
    const m = readMeasuredHeader(h)
    if (typeof m === 'string') add(head.line, column, m)
    else measured.push(m)
  })
  const body = lines.slice(1)
  if (body.length === 0) add(head.line + 1, null, 'The file has a header and no data: add one row of numbers per measurement')
  if (body.length > MAX_DATASET_ROWS) {
    add(body[MAX_DATASET_ROWS]!.line, null, `A data set may have at most ${MAX_DATASET_ROWS} rows of data; this one has ${body.length}. Keep every second point, or split it`)
    return { ok: false, problems }
  }
  const rows: (number | null)[][] = []
  for (const { line, cells } of body) {
    if (cells.length !== headers.length) {
      add(line, Math.min(cells.length, headers.length) + 1, `this line has ${cells.length} cell${cells.length === 1 ? '' : 's'} and the header ${headers.length}: give every column a value (leave a measurement empty as ,,)`)
      continue
    }
    const row: (number | null)[] = []
    cells.forEach((cell, c) => {
      const x = readNumber(cell)
      if (x === 'bad') { add(line, c + 1, `"${cell.trim()}" in ${headers[c]} is not a number: ${cellAdvice(cell)}`); row.push(null); return }
      if (c === 0 && x === null) add(line, 1, `${headers[0]} is empty: every row needs its study variable`)
      row.push(x)
    })
    if (row.slice(1).every((x) => x === null) && !problems.some((p) => p.line === line)) add(line, 2, 'this row has no measured value: fill one in or delete the row')
    if (typeof study !== 'string' && row[0] !== null && row[0] !== undefined) {
      const v = row[0]
      if (study.kind === 'volume' && v < 0) add(line, 1, `an added volume cannot be negative (${formatNumber(v)})`)
      if (study.kind === 'total' && v < 0) add(line, 1, `a total cannot be negative (${formatNumber(v)})`)
    }
    measured.forEach((m, k) => {
      const x = row[k + 1]
      if (x === null || x === undefined) return
      if ((m.kind === 'species' || m.kind === 'dissolved') && !(x > 0)) add(line, k + 2, `${headers[k + 1]} must be above 0, not ${formatNumber(x)}: leave the cell empty when nothing was measured`)
    })
    rows.push(row)
  }
  if (problems.length) return { ok: false, problems: problems.sort((a, b) => a.line - b.line || (a.column ?? 0) - (b.column ?? 0)) }
  return { ok: true, data: { headers, study: study as StudyColumn, measured, rows } }
}

/** "line 4, column 2 (pH): …" for messages and the command line. */
export function problemText(p: DataSetProblem, headers?: string[]): string {
  const where = p.column === null ? `line ${p.line}` : `line ${p.line}, column ${p.column}${headers?.[p.column - 1] ? ` (${headers[p.column - 1]})` : ''}`
  return `${where}: ${p.message}`
}
