/**
 * Titration answers in words and in the user's units: the volume unit the
 * file wrote (mL, L, uL, µL; the answer itself is in mL), the end points,
 * the dose to a target pH. Used by the CLI, the workbench and the report.
 */
import { unitInfo } from '../poise/units'
import type { SweepResult, TitrationCurveResult, TitrationDoseResult } from '../types/result'

/** A titration curve read as a sweep over the added volume (mL): the species diagrams and toxic cautions take it as they take a sweep. */
export function titrationAsSweep(t: TitrationCurveResult): SweepResult {
  return { variable: 'volume', component: null, values: t.values, points: t.points, ...(t.limits ? { limits: t.limits } : {}) }
}

/** A volume in mL expressed in `unit` (a volume unit of the language; mL when it is not one). */
export function volumeInUnit(mL: number, unit: string): { value: number; unit: string } {
  const info = unitInfo(unit)
  if (!info || info.dimension !== 'volume') return { value: mL, unit: 'mL' }
  return { value: mL / 1000 / info.factor, unit }
}

/** `24.995 mL`, five significant figures, in the unit the file wrote. */
export function formatVolume(mL: number, unit: string): string {
  const v = volumeInUnit(mL, unit)
  return `${Number(v.value.toPrecision(5))} ${v.unit}`
}

/** "end point at 25.00 mL, pH 7.00" for each end point; a sentence when there is none. */
export function endPointSentences(t: TitrationCurveResult): string[] {
  if (t.equivalencePoints.length === 0) return ['no end point stands out along this curve']
  return t.equivalencePoints.map((e, k) => `end point ${k + 1} at ${formatVolume(e.volume, t.unit)}, pH ${e.pH.toFixed(2)}`)
}

/** The dose answer: "pH 7 is reached after 12.5 mL of titrant", or why not. */
export function doseSentence(d: TitrationDoseResult): string {
  if (d.volume === null) return d.reason ?? `pH ${d.target.pH} is not reachable with this titrant`
  return `pH ${d.target.pH} is reached after ${formatVolume(d.volume, d.unit)} of titrant`
}
