/** `sweep` statements: checks and the list of values, in model units. */
import type { ModelComponent, ModelSweep } from './model'
import type { Reporter } from './reporter'
import type { Quantity, SweepAxis } from './statements'
import { parseFormula, type Abbreviations } from './formula'
import { convert, unitInfo, UNIT_HINTS, type Dimension } from './units'
import { checkRange, formatNumber, SIZE_LIMITS, type LimitName } from './limits'

const round = (x: number) => Number(x.toPrecision(12))

/**
 * One axis of values: a `sweep` line, or an axis of a `map` line (`noun`
 * names it in messages: `sweep`, `map axis`).
 */
export function compileSweep(s: SweepAxis, components: ModelComponent[], report: Reporter, abbreviations?: Abbreviations, noun = 'sweep'): ModelSweep | null {
  let component: ModelComponent | null = null
  if (s.variable === 'pH' && !components.some((c) => c.name === 'H+')) {
    report.error('P080', `a pH ${noun} needs H+ as a component: add \`component H+ balance\``, s.variableTok)
    return null
  }
  if (s.variable === 'total' || s.variable === 'pressure') {
    const name = s.target!.image
    component = components.find((c) => c.name === (parseFormula(name, abbreviations).formula?.name ?? name)) ?? null
    const want = s.variable
    if (!component || component.mode !== want) {
      report.error('P080', `${noun} ${want} needs a component declared with \`${want}\`: ${name} is ${component ? `declared with ${component.mode}` : 'not a component'}`, s.target!)
      return null
    }
  }
  const dimension: Dimension | null = s.variable === 'pH' ? null : s.variable === 'temperature' ? 'temperature' : s.variable === 'pressure' ? 'pressure' : 'concentration'
  const value = (q: Quantity, isStep: boolean, fallbackUnit: string | null): number | null => {
    if (dimension === null) {
      if (q.unit) { report.error('P050', 'pH has no unit: remove it', q.unit); return null }
      return q.value
    }
    const unit = q.unit?.image ?? fallbackUnit
    if (unit === null) { report.error('P050', `expected ${UNIT_HINTS[dimension]} after ${q.number.image}`, q.number); return null }
    const info = unitInfo(unit)
    if (info && dimension === 'concentration' && info.dimension === 'mass-concentration') {
      if (component!.molarMass <= 0) { report.error('P051', `no molar mass for ${component!.name}: give the ${noun} in mol/L`, q.unit ?? q.number); return null }
      return (q.value * info.factor) / component!.molarMass
    }
    if (!info || info.dimension !== dimension) { report.error('P050', `${unit} is not ${UNIT_HINTS[dimension]}`, q.unit ?? q.number); return null }
    // A step is a difference: kelvin and Celsius steps are the same size.
    return isStep ? q.value * info.factor : convert(q.value, unit, dimension)
  }
  // `from 1e-6 to 1e-1 mol/L`: an end without a unit takes the other end's.
  const from = value(s.start, false, s.end.unit?.image ?? null)
  const to = value(s.end, false, s.start.unit?.image ?? null)
  if (from === null || to === null) return null
  if (s.variable === 'temperature' && (from <= -273.15 || to <= -273.15)) {
    report.error('P081', 'a temperature must be above absolute zero', from <= -273.15 ? s.start.number : s.end.number)
    return null
  }
  // Both ends in range means every point between them is.
  const limit: LimitName = s.variable === 'total' ? 'concentration' : s.variable
  const magnitude = s.variable === 'total' && component!.name === 'H+'
  const ends = [[from, s.start], [to, s.end]] as const
  const rangeOk = ends.map(([v, q]) => {
    if (s.variable === 'total' && v < 0 && !magnitude) return true // reported as P052 below
    if (s.variable === 'pressure' && v <= 0) return true
    const what = `the ${noun}'s ${q === s.start ? 'first' : 'last'} ${s.variable === 'pH' ? 'pH' : s.variable === 'temperature' ? 'temperature' : s.variable === 'total' ? `total of ${component!.name}` : `pressure of ${component!.name}`}`
    return checkRange(report, limit, v, q.unit ?? q.number, { magnitude, what })
  })
  if (!rangeOk.every(Boolean)) return null
  if (s.log && (s.variable === 'pH' || s.variable === 'temperature')) {
    report.error('P080', `a ${s.variable} ${noun} cannot be logarithmic: remove \`log\``, s)
    return null
  }
  if (s.log && (from <= 0 || to <= 0)) {
    report.error('P080', `a logarithmic ${noun} needs positive end values`, s)
    return null
  }
  let values: number[]
  if (s.points) {
    const n = s.points.value
    if (!Number.isInteger(n) || n < 2 || n > SIZE_LIMITS.maxSweepPoints) {
      report.error('P080', `points must be a whole number from 2 to ${SIZE_LIMITS.maxSweepPoints}, not ${formatNumber(n)}`, s.points.number)
      return null
    }
    const a = s.log ? Math.log10(from) : from
    const b = s.log ? Math.log10(to) : to
    values = Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1))
  } else {
    // With `log`, the step is in decades (0.1 = ten points a decade) and has no unit.
    const step = s.log ? (s.step!.unit ? null : s.step!.value) : value(s.step!, true, s.start.unit?.image ?? s.end.unit?.image ?? null)
    if (step === null) {
      if (s.log) report.error('P050', `the step of a logarithmic ${noun} is in decades and has no unit`, s.step!.unit!)
      return null
    }
    const a = s.log ? Math.log10(from) : from
    const b = s.log ? Math.log10(to) : to
    const ratio = (b - a) / step
    // A tiny step can make the count overflow: it is only shown when it is a sensible number.
    const count = step === 0 || !Number.isFinite(ratio) ? Infinity : Math.floor(ratio + 1e-9) + 1
    if (!(count >= 2) || count > SIZE_LIMITS.maxSweepPoints) {
      const shown = count <= 1e9 ? `${formatNumber(count)} points` : 'more than a billion points'
      report.error('P080', step === 0 || count < 2
        ? `the step ${s.step!.number.image} does not lead from ${s.start.number.image} to ${s.end.number.image}: use a step with the sign of (to − from), not 0`
        : `this ${noun} has ${shown}; it may have 2 to ${SIZE_LIMITS.maxSweepPoints}: use a larger step`, s.step!.number)
      return null
    }
    values = Array.from({ length: count }, (_, i) => a + step * i)
  }
  const points = (s.log ? values.map((v) => Math.pow(10, v)) : values).map(round)
  if (s.variable === 'total' && points.some((v) => v < 0) && component!.name !== 'H+') {
    report.error('P052', 'a total cannot be negative (only H+ may be, as a proton deficit)', s)
    return null
  }
  if (s.variable === 'pressure' && points.some((v) => v <= 0)) {
    report.error('P052', 'a partial pressure must be positive', s)
    return null
  }
  return { variable: s.variable, component: component?.name ?? null, values: points, log: s.log, line: report.lineOf(s.start.number.from) }
}
