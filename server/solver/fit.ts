/**
 * Fitting constants to a data set (shared/fit/dataset.ts) by
 * Levenberg–Marquardt on exact solves.
 *
 * - Parameters: log10 K of each reaction the file marks `fit`, as written.
 *   Every formation constant moves linearly with them, by the compiler's
 *   `reactionWeights`, so each model of the loop is the compiled one with
 *   its formation constants shifted (no recompiling).
 * - Each evaluation solves the study at the data's variable values: the
 *   titration at the data's added volumes (titration.ts), or a sweep of pH
 *   or of a total at the data's values (index.ts), continued from point to
 *   point as those are.
 * - Residuals: weight × (model − measured) in each column's own units (pH,
 *   log10 mol/L, or the column's concentration unit), empty cells left out.
 * - The Jacobian by forward differences of exact solves in each log K
 *   (see DEVELOPERS.md for why not the solver's sensitivities); standard
 *   errors from s²(JᵀJ)⁻¹ at the minimum.
 */
import { LuDecomposition, Matrix, SingularValueDecomposition } from 'ml-matrix'
import { compile, type CompileOptions } from '../../shared/poise/index'
import type { ConstantKind, Model, ModelReaction } from '../../shared/poise/model'
import { constantFromLogK } from '../../shared/poise/reactions'
import { unitInfo } from '../../shared/poise/units'
import { molarMassOf } from '../../shared/poise/elements'
import { dissolvedTarget } from '../../shared/poise/limitStatement'
import type { DataSet, MeasuredColumn } from '../../shared/fit/dataset'
import { constantSpan } from '../../shared/fit/constants'
import type { Result } from '../../shared/types/result'
import type { FittedConstant, FitColumn, FitResult, FitOutcome } from '../../shared/types/fit'
import { sweep, titration, type SolveOptions } from './index'

/** Most Levenberg–Marquardt iterations (each one Jacobian). */
export const FIT_MAX_ITERATIONS = 50
/** The step in log K of the forward differences. */
const DIFFERENCE_STEP = 1e-5
/** A step moves no log K by more than this (a solve far from the last one may not converge). */
const MAX_STEP = 1
/** Converged when a step lowers the sum of squares by less than this share, or moves every log K by less than STEP_TOLERANCE. */
const COST_TOLERANCE = 1e-10
const STEP_TOLERANCE = 1e-8
/** Two constants whose correlation is beyond this are flagged. */
export const CORRELATION_WARNING = 0.95
/** A constant whose standard error in log K is beyond this (a factor of 10 in K) is "not determined by the data". */
export const UNDETERMINED_LOG_ERROR = 1
/** Points of the fitted curve drawn over the data. */
const CURVE_POINTS = 80

export interface FitOptions {
  /** Weight of each measured column by its header; 1 when not given. */
  weights?: Record<string, number>
  /** Resolves `use` for the recompiles (as for compile). */
  compileOptions?: CompileOptions
  /** Absolute deadline (Date.now()); the fit stops unconverged past it. */
  deadline?: number
  /** Told after each iteration. */
  onProgress?: (progress: { iteration: number; maxIterations: number; sumOfSquares: number }) => void
}

export type { FittedConstant, FitColumn, FitResult, FitOutcome }

type Reader = (model: Model, r: Result) => number | null

interface Shift { species: number[]; solids: number[]; gases: number[] }

/** Fits the constants `source` marks `fit` to `data`. Never throws. */
export function fitConstants(source: string, data: DataSet, options: FitOptions = {}): FitOutcome {
  try {
    return fitUnguarded(source, data, options)
  } catch (error) {
    return { ok: false, message: `The fit stopped on an internal error (please report it with the file and data): ${(error as Error)?.message ?? String(error)}` }
  }
}

function fitUnguarded(source: string, data: DataSet, options: FitOptions): FitOutcome {
  const compiled = compile(source, options.compileOptions)
  const model = compiled.model
  const errors = compiled.diagnostics.filter((d) => d.severity === 'error')
  if (!model || errors.length) return { ok: false, message: `The model has errors; fix them first (line ${errors[0]?.range.line ?? 1}: ${errors[0]?.message ?? 'it does not compile'}).` }

  const fitted = chooseReactions(model)
  if (typeof fitted === 'string') return { ok: false, message: fitted }

  const readers: Reader[] = []
  for (const [k, m] of data.measured.entries()) {
    const reader = readerFor(model, m)
    if (typeof reader === 'string') return { ok: false, message: `Column ${k + 2} (${data.headers[k + 1]}): ${reader}` }
    readers.push(reader)
  }
  const study = studyValues(model, data)
  if (typeof study === 'string') return { ok: false, message: `Column 1 (${data.headers[0]}): ${study}` }

  const weights = data.measured.map((_, k) => {
    const w = options.weights?.[data.headers[k + 1]!]
    return w !== undefined && Number.isFinite(w) && w > 0 ? w : 1
  })
  const cells: { row: number; col: number }[] = []
  data.rows.forEach((row, i) => data.measured.forEach((_, k) => { if (row[k + 1] !== null && row[k + 1] !== undefined) cells.push({ row: i, col: k }) }))
  const n = cells.length
  const p = fitted.length
  if (n <= p) return { ok: false, message: `${p} constant${p === 1 ? '' : 's'} to fit need${p === 1 ? 's' : ''} more than ${p} measured value${p === 1 ? '' : 's'}; the data set has ${n}. Add measurements, or fit fewer constants.` }

  // How the formation constants move with each fitted log K (the compiler's reactionWeights).
  const indexOf = fitted.map((r) => model.reactions.indexOf(r))
  const weightsOf = <T extends { reactionWeights?: { reaction: number; weight: number }[] }>(list: T[], k: number) =>
    list.map((x) => x.reactionWeights?.find((w) => w.reaction === indexOf[k])?.weight ?? 0)
  const shifts: Shift[] = fitted.map((_, k) => ({ species: weightsOf(model.species, k), solids: weightsOf(model.solids, k), gases: weightsOf(model.gases, k) }))
  const modelAt = (delta: number[]): Model => {
    const move = <T extends { logK: number; logKRef: number }>(list: T[], key: keyof Shift): T[] => list.map((x, i) => {
      let d = 0
      for (let k = 0; k < p; k++) d += shifts[k]![key][i]! * delta[k]!
      return d === 0 ? x : { ...x, logK: x.logK + d, logKRef: x.logKRef + d }
    })
    return { ...model, species: move(model.species, 'species'), solids: move(model.solids, 'solids'), gases: move(model.gases, 'gases') }
  }

  const solveOptions: SolveOptions = options.deadline !== undefined ? { deadline: options.deadline } : {}
  const predict = (delta: number[], values: number[]): { results: Result[]; model: Model } | string => {
    const m = modelAt(delta)
    const results = solveStudy(m, study.kind, values, study.component, solveOptions)
    const failed = results.findIndex((r) => !r.converged)
    if (failed >= 0) return `at ${data.headers[0]} = ${formatValue(study.toWritten(values[failed]!))} the model did not solve: ${results[failed]!.reason ?? 'no reason given'}`
    return { results, model: m }
  }
  const residuals = (delta: number[]): { r: Float64Array; fittedRows: (number | null)[][] } | string => {
    const out = predict(delta, study.values)
    if (typeof out === 'string') return out
    const fittedRows = out.results.map((res) => readers.map((read) => read(out.model, res)))
    const r = new Float64Array(n)
    for (let i = 0; i < n; i++) {
      const { row, col } = cells[i]!
      const y = fittedRows[row]![col]
      if (y === null || y === undefined || !Number.isFinite(y)) return `at ${data.headers[0]} = ${formatValue(data.rows[row]![0]!)} the model gives no value for ${data.headers[col + 1]}`
      r[i] = weights[col]! * (y - data.rows[row]![col + 1]!)
    }
    return { r, fittedRows }
  }
  const sumSq = (r: Float64Array) => r.reduce((s, x) => s + x * x, 0)
  const jacobian = (delta: number[], r0: Float64Array): Matrix | string => {
    const J = new Matrix(n, p)
    for (let k = 0; k < p; k++) {
      const moved = delta.slice()
      moved[k] = moved[k]! + DIFFERENCE_STEP
      const rk = residuals(moved)
      if (typeof rk === 'string') return rk
      for (let i = 0; i < n; i++) J.set(i, k, (rk.r[i]! - r0[i]!) / DIFFERENCE_STEP)
    }
    return J
  }

  let delta = new Array<number>(p).fill(0)
  const first = residuals(delta)
  if (typeof first === 'string') return { ok: false, message: `With the constants as written, ${first}. Check the model and the data's units.` }
  let current = first
  let cost = sumSq(current.r)
  let lambda = 1e-3
  let converged = false
  let iterations = 0
  let reason: string | undefined
  let J: Matrix | string = jacobian(delta, current.r)
  if (typeof J === 'string') return { ok: false, message: `With the constants as written, ${J}. Check the model and the data's units.` }

  while (!converged && iterations < FIT_MAX_ITERATIONS) {
    if (options.deadline !== undefined && Date.now() > options.deadline) { reason = 'The time limit of a fit ran out before it converged: use fewer data points or fit fewer constants.'; break }
    iterations++
    const A = J.transpose().mmul(J)
    const g = J.transpose().mmul(Matrix.columnVector(Array.from(current.r)))
    let accepted = false
    while (lambda < 1e12) {
      const damped = A.clone()
      for (let k = 0; k < p; k++) damped.set(k, k, A.get(k, k) * (1 + lambda) + 1e-30)
      const lu = new LuDecomposition(damped)
      if (lu.isSingular()) { lambda *= 10; continue }
      const step = lu.solve(g.clone().mul(-1)).to1DArray()
      const longest = Math.max(...step.map(Math.abs))
      const scale = longest > MAX_STEP ? MAX_STEP / longest : 1
      const trialDelta = delta.map((d, k) => d + step[k]! * scale)
      const trial = residuals(trialDelta)
      const trialCost = typeof trial === 'string' ? Infinity : sumSq(trial.r)
      if (typeof trial !== 'string' && trialCost <= cost) {
        const gain = cost - trialCost
        delta = trialDelta
        current = trial
        if (gain <= COST_TOLERANCE * Math.max(cost, Number.MIN_VALUE) || longest * scale < STEP_TOLERANCE) converged = true
        cost = trialCost
        lambda = Math.max(lambda / 10, 1e-12)
        accepted = true
        break
      }
      lambda *= 10
    }
    // No step lowers the sum of squares: the minimum, to the precision of the solves.
    if (!accepted) converged = true
    options.onProgress?.({ iteration: iterations, maxIterations: FIT_MAX_ITERATIONS, sumOfSquares: cost })
    if (accepted) {
      J = jacobian(delta, current.r)
      if (typeof J === 'string') { reason = `The fit stopped: ${J}.`; break }
    }
  }
  if (!converged && !reason) reason = `Not converged in ${FIT_MAX_ITERATIONS} iterations: the data may not determine these constants; fit fewer, or start from values closer to the data.`
  if (typeof J === 'string') return { ok: false, message: reason ?? J }

  // Statistics at the minimum.
  const dof = n - p
  const s2 = cost / dof
  const A = J.transpose().mmul(J)
  const determined = determinedConstants(A)
  const logErrors: (number | null)[] = fitted.map(() => null)
  const cov = new Matrix(p, p)
  const kept = fitted.map((_, k) => k).filter((k) => determined[k])
  if (kept.length) {
    const sub = new Matrix(kept.length, kept.length)
    kept.forEach((a, i) => kept.forEach((b, j) => sub.set(i, j, A.get(a, b))))
    const lu = new LuDecomposition(sub)
    if (!lu.isSingular()) {
      const inv = lu.solve(Matrix.eye(kept.length))
      kept.forEach((a, i) => kept.forEach((b, j) => cov.set(a, b, inv.get(i, j) * s2)))
      for (const k of kept) {
        const se = Math.sqrt(Math.max(cov.get(k, k), 0))
        if (Number.isFinite(se) && se <= UNDETERMINED_LOG_ERROR) logErrors[k] = se
      }
    }
  }
  // Correlations between determined constants; an undetermined one correlates with nothing (0), and 1 with itself.
  const correlation = fitted.map((_, a) => fitted.map((_, b) => {
    if (a === b) return 1
    if (logErrors[a] === null || logErrors[b] === null) return 0
    const c = cov.get(a, b) / Math.sqrt(cov.get(a, a) * cov.get(b, b))
    return Number.isFinite(c) ? Math.max(-1, Math.min(1, c)) : 0
  }))
  const constants: FittedConstant[] = fitted.map((r, k) => {
    const logK = r.logK + delta[k]!
    const shown = constantFromLogK(r.kind, logK, logErrors[k] ?? 0)
    const span = constantSpan(source, r.line)
    return {
      reaction: span?.reaction ?? r.equation, kind: r.kind, value: clean(shown.value), standardError: logErrors[k] === null ? null : clean(shown.error),
      initial: r.value, logK: clean(logK), logKStandardError: logErrors[k] === null ? null : clean(logErrors[k]!), defines: r.defines, line: r.line,
    }
  })
  const warnings: string[] = []
  const measuredNames = data.headers.slice(1).join(', ')
  constants.forEach((c, k) => {
    if (logErrors[k] !== null) return
    warnings.push(`${c.kind} of ${c.reaction} is not determined by these data: ${measuredNames} hardly change${data.measured.length === 1 ? 's' : ''} with it, so any value within a wide range fits as well. ${adviceFor(c)}`)
  })
  for (let a = 0; a < p; a++) for (let b = a + 1; b < p; b++) {
    const r = correlation[a]![b]!
    if (Math.abs(r) > CORRELATION_WARNING && logErrors[a] !== null && logErrors[b] !== null) {
      warnings.push(`${constants[a]!.kind} of ${constants[a]!.reaction} and ${constants[b]!.kind} of ${constants[b]!.reaction} are correlated (r = ${r.toFixed(3)}): the data fix a combination of the two better than either. Measurements over a wider range of ${data.headers[0]}, or of another quantity, would tell them apart; or fit one and keep the other as written.`)
    }
  }

  const columns: FitColumn[] = data.measured.map((_, k) => {
    const measured = data.rows.map((row) => row[k + 1] ?? null)
    const fittedValues = current.fittedRows.map((row) => (row[k] === null || row[k] === undefined ? null : clean(row[k]!)))
    return {
      header: data.headers[k + 1]!, weight: weights[k]!, measured, fitted: fittedValues,
      residual: measured.map((m, i) => (m === null || fittedValues[i] === null ? null : clean(fittedValues[i]! - m))),
    }
  })
  const grid = curveGrid(study.values)
  const atGrid = predict(delta, grid)
  const curve = {
    values: grid.map((v) => clean(study.toWritten(v))),
    columns: data.measured.map((_, k) => ({
      header: data.headers[k + 1]!,
      values: typeof atGrid === 'string' ? grid.map(() => null) : atGrid.results.map((res) => { const y = readers[k]!(atGrid.model, res); return y === null || !Number.isFinite(y) ? null : clean(y) }),
    })),
  }
  return {
    ok: true,
    fit: {
      converged, iterations, points: n, degreesOfFreedom: dof, residualStandardDeviation: clean(Math.sqrt(s2)),
      constants, correlation: correlation.map((row) => row.map(clean)), warnings, ...(reason ? { reason } : {}),
      variable: { header: data.headers[0]!, values: data.rows.map((row) => row[0]!) },
      columns, curve,
    },
  }
}

/**
 * Which constants the data determine at all: JᵀJ's directions whose
 * singular value is below 1e-12 of the largest are not seen by the data, and
 * a constant with a share of 0.1 or more in such a direction is not
 * determined (its standard error would be unbounded).
 */
function determinedConstants(A: Matrix): boolean[] {
  const p = A.rows
  const svd = new SingularValueDecomposition(A, { autoTranspose: true })
  const sv = svd.diagonal
  const largest = Math.max(...sv, 0)
  const V = svd.rightSingularVectors
  const out = new Array<boolean>(p).fill(largest > 0)
  sv.forEach((x, i) => {
    if (x > largest * 1e-12) return
    for (let k = 0; k < p; k++) if (Math.abs(V.get(k, i)) >= 0.1) out[k] = false
  })
  return out
}

/** Numbers as JSON carries them: never NaN or Infinity (0 stands for neither here; callers never produce them on a converged fit). */
function clean(x: number): number {
  return Number.isFinite(x) ? x : 0
}

function formatValue(x: number): string {
  return String(Number(x.toPrecision(6)))
}

/** What measurements would determine a constant, by its kind. */
function adviceFor(c: FittedConstant): string {
  switch (c.kind) {
    case 'pKa': case 'Ka':
      return `Measurements where ${c.defines} and its base are both a sizeable share — pH values near ${formatValue(c.kind === 'pKa' ? c.value : -Math.log10(c.value))} — would determine it.`
    case 'pKsp': case 'Ksp': case 'logKsp':
      return `Measurements where ${c.defines} is present (dissolved totals or free ions in equilibrium with it) would determine it.`
    default:
      return `Measurements where ${c.defines} makes up a sizeable share of its components — its concentration, or the pH or free ion where it forms — would determine it.`
  }
}

/** The reactions the file marks `fit` (a library's marks stay its own); a string says why there are none. */
function chooseReactions(model: Model): ModelReaction[] | string {
  const marked = model.reactions.filter((r) => r.fit && r.library === null)
  if (marked.length) return marked
  return 'No constant is marked to fit: write `fit` after the value of each constant the data should determine, as in `reaction HA <=> A- + H+  pKa 4.70 fit`.'
}

/** Reads a measured column from an answer, in the column's units; a string when the model cannot predict it. */
function readerFor(model: Model, m: MeasuredColumn): Reader | string {
  const concentrationIn = (unit: string, grams: number | null): ((molar: number) => number | null) | string => {
    const info = unitInfo(unit)!
    if (info.dimension === 'concentration') return (c) => c / info.factor
    if (grams === null || !(grams > 0)) return `no molar mass for a mass unit here: give the column in mol/L`
    return (c) => (c * grams) / info.factor
  }
  const speciesIndex = (name: string) => model.species.findIndex((s) => s.name === name)
  const noSpecies = (name: string) => `the model has no species ${name}; its species are ${model.species.map((s) => s.name).join(', ')}`
  switch (m.kind) {
    case 'pH':
      if (!model.components.some((c) => c.name === 'H+')) return 'the model has no H+ component, so it gives no pH'
      return (_model, r) => r.pH
    case 'species': {
      const at = speciesIndex(m.species)
      if (at < 0) return noSpecies(m.species)
      const convert = concentrationIn(m.unit, molarMassOf(model.species[at]!.elements))
      if (typeof convert === 'string') return convert
      return (_model, r) => { const s = r.species.find((x) => x.name === m.species); return s ? convert(s.concentration) : null }
    }
    case 'log': {
      if (speciesIndex(m.species) < 0) return noSpecies(m.species)
      return (_model, r) => r.species.find((x) => x.name === m.species)?.log10 ?? null
    }
    case 'dissolved': {
      const target = dissolvedTarget(m.target, model.components)
      if (typeof target === 'string') {
        return target === 'water' ? `${m.target} is in water itself and has no dissolved total`
          : target === 'proton' ? 'H+ has no dissolved total: measure the pH instead'
            : `the model has no component or element ${m.target}; its components are ${model.components.map((c) => c.name).join(', ')}`
      }
      const convert = concentrationIn(m.unit, target.grams)
      if (typeof convert === 'string') return convert
      return (_model, r) => {
        let sum = 0
        target.weights.forEach((w, j) => { if (w) sum += w * (r.components[j]?.dissolved ?? Number.NaN) })
        return Number.isFinite(sum) ? convert(sum) : null
      }
    }
  }
}

interface Study {
  kind: 'volume' | 'pH' | 'total'
  component: string | null
  /** The data's variable in the solver's units (mL, pH, mol/L). */
  values: number[]
  /** Back to the data's units. */
  toWritten: (v: number) => number
}

function studyValues(model: Model, data: DataSet): Study | string {
  const written = data.rows.map((row) => row[0]!)
  const s = data.study
  switch (s.kind) {
    case 'volume': {
      if (!model.titration) return 'an added volume needs a titration in the model: add `sample volume`, `titrant` and `titrate from … to … step …` lines'
      const perML = unitInfo(s.unit)!.factor * 1000
      return { kind: 'volume', component: null, values: written.map((v) => v * perML), toWritten: (v) => v / perML }
    }
    case 'pH':
      if (!model.components.some((c) => c.name === 'H+')) return 'the model has no H+ component, so the pH cannot be set'
      return { kind: 'pH', component: null, values: written, toWritten: (v) => v }
    case 'total': {
      const c = model.components.find((x) => x.name === s.component)
      if (!c) return `the model has no component ${s.component}; its components are ${model.components.map((x) => x.name).join(', ')}`
      const info = unitInfo(s.unit)!
      const factor = info.dimension === 'concentration' ? info.factor : c.molarMass > 0 ? info.factor / c.molarMass : null
      if (factor === null) return `no molar mass for ${c.name}: give the total in mol/L`
      return { kind: 'total', component: c.name, values: written.map((v) => v * factor), toWritten: (v) => v / factor }
    }
  }
}

/** Exact solves of the study at each value, continued from point to point (never the file's Monte Carlo draws). */
function solveStudy(model: Model, kind: Study['kind'], values: number[], component: string | null, options: SolveOptions): Result[] {
  if (kind === 'volume') {
    const t = model.titration!
    const out = titration({ ...model, sweep: null, limits: undefined, monteCarlo: undefined, titration: { ...t, values, targetPH: null } }, options)
    return 'points' in out ? out.points : values.map(() => ({ converged: false, reason: out.reason } as Result))
  }
  const swept: Model = { ...model, titration: undefined, limits: undefined, monteCarlo: undefined, sweep: { variable: kind, component: kind === 'pH' ? null : component, values, log: false, line: 0 } }
  return sweep(swept, options).points
}

/** CURVE_POINTS values over the data's range (in the solver's units), evenly spaced. */
function curveGrid(values: number[]): number[] {
  const lo = Math.min(...values)
  const hi = Math.max(...values)
  if (!(hi > lo)) return [lo]
  return Array.from({ length: CURVE_POINTS }, (_, i) => lo + ((hi - lo) * i) / (CURVE_POINTS - 1))
}
