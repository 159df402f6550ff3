/**
 * Plain-text tables of a Result and of a sweep, for the CLI: columns aligned,
 * numbers in engineering-friendly exponent form.
 */
import type { Model } from '../shared/poise/model'
import type { MapAnswer, MapAxis, Result, SweepResult, TitrationResult } from '../shared/types/result'
import { mapCell } from '../shared/results/map-columns'
import { doseSentence, endPointSentences, formatVolume, titrationAsSweep, volumeInUnit } from '../shared/results/titration'
import { dissolvedText } from '../shared/results/names'
import { MOLAR_SCALE, type UnitScale } from '../shared/results/units'
import { limitSentence } from '../shared/results/limits'
import { formatAmountUncertainty, formatLogUncertainty, mainContributorText, uncertaintyMethodText } from '../shared/results/uncertainty'

/** `4.63–4.82`: a point's pH band from `uncertainty draws N`; `-` where it has none. */
const pHBand = (p: Result) => (p.pHUncertainty?.low !== undefined && p.pHUncertainty.high !== undefined ? `${fixed(p.pHUncertainty.low, 2)}–${fixed(p.pHUncertainty.high, 2)}` : '-')
const anyBand = (points: Result[]) => points.some((p) => p.uncertainty?.method === 'monte-carlo')

const exp = (v: number) => (v === 0 ? '0' : v.toExponential(3))
const fixed = (v: number, d: number) => v.toFixed(d)
/** A value that may not exist (null in the Result): 'none' instead of a made-up number. */
const fixedOrNone = (v: number | null, d: number) => (v === null ? 'none' : fixed(v, d))

/** Aligns rows of cells: first column left, the others right. */
function align(rows: string[][]): string {
  const widths = rows[0].map((_, k) => Math.max(...rows.map((r) => (r[k] ?? '').length)))
  return rows
    .map((r) => r.map((cell, k) => (k === 0 ? cell.padEnd(widths[k]) : cell.padStart(widths[k]))).join('  ').trimEnd())
    .join('\n')
}

/** A value in mol/L times a unit's factor; `-` when a mass unit has no molar mass for it. */
const scaledExp = (v: number, factor: number | null) => (factor === null ? '-' : exp(v * factor))

export function formatResultTable(model: Model, r: Result, scale: UnitScale = MOLAR_SCALE): string {
  const out: string[] = [model.title, '']
  if (!r.converged) out.push(`NOT CONVERGED: ${r.reason ?? 'no reason given'}`, '')
  out.push(`pH ${fixed(r.pH, 3)}${r.pHUncertainty ? ` ${formatLogUncertainty(r.pHUncertainty)}` : ''}   ionic strength ${exp(r.ionicStrength)} mol/L   ${r.temperatureC} °C   ` +
    `${r.iterations} iterations, max scaled residual ${exp(r.residuals.maxScaled)}`, '')
  // With a ± on some constant: one more column per table, and how the ± were found.
  const pm = r.uncertainty !== undefined
  if (pm) out.push(uncertaintyMethodText(r)!, ...(mainContributorText(r.pHUncertainty) ? [`pH ± ${mainContributorText(r.pHUncertainty)}`] : []), '')
  const species = [...r.species].sort((a, b) => b.concentration - a.concentration)
  out.push(align([
    ['species', scale.unit, 'log10 mol/L', ...(pm ? ['± log10'] : []), 'activity', 'gamma'],
    ...species.map((s) => [s.name, scaledExp(s.concentration, scale.species(s.name)), fixedOrNone(s.log10, 3), ...(pm ? [formatLogUncertainty(s.log10Uncertainty)] : []), scaledExp(s.activity, scale.species(s.name)), fixed(s.gamma, 4)]),
  ]))
  if (r.solids.length > 0) {
    out.push('', align([
      ['solid', 'present', 'mol/L', 'SI', ...(pm ? ['± SI'] : [])],
      ...r.solids.map((s) => [s.name + (s.suppressed ? ' (suppressed)' : ''), s.present ? 'yes' : 'no', exp(s.amount), fixedOrNone(s.saturationIndex, 3), ...(pm ? [formatLogUncertainty(s.saturationIndexUncertainty)] : [])]),
    ]))
  }
  if (r.gases && r.gases.length > 0) {
    out.push('', align([['gas', 'atm', 'log10'], ...r.gases.map((g) => [g.name, exp(g.pressure), fixedOrNone(g.log10, 3)])]))
  }
  out.push('', align([
    ['component', 'mode', 'unit', 'total', 'dissolved', 'free'],
    ...r.components.map((c) => {
      const factor = scale.component(c.name)
      const fixedFree = c.mode === 'pressure' || c.mode === 'excess'
      return [
        c.name, c.mode, scale.componentUnit(c.name), scaledExp(c.total, factor),
        c.dissolved === undefined ? '-' : `${scaledExp(c.dissolved, factor)}${c.dissolvedUncertainty ? ` ${formatAmountUncertainty(c.dissolvedUncertainty, factor)}` : ''} (${dissolvedText(c.name)})`,
        fixedFree ? `${exp(c.free)}${c.mode === 'pressure' ? ' atm' : ''}` : scaledExp(c.free, factor),
      ]
    }),
  ]))
  for (const w of r.warnings ?? []) out.push(`warning: ${w}`)
  return out.join('\n')
}

export function formatSweepTable(model: Model, s: SweepResult, scale: UnitScale = MOLAR_SCALE): string {
  const label = s.variable === 'total' || s.variable === 'pressure' ? `${s.variable} ${s.component}` : s.variable
  const solidNames = model.solids.map((x) => x.name)
  // The dissolved total of every component given by its total: what a sweep is usually read for.
  const totals = model.components.filter((c) => c.mode === 'total' && c.name !== 'H+').map((c) => c.name)
  const band = anyBand(s.points)
  const rows = [[label, 'pH', ...(band ? ['pH 95 %'] : []), 'I mol/L', ...totals.map((n) => `${dissolvedText(n)} ${scale.componentUnit(n)}`), 'solids present', 'status']]
  s.points.forEach((p, k) => {
    const present = p.solids.filter((x) => x.present && solidNames.includes(x.name)).map((x) => x.name).join(' ') || '-'
    const dissolved = totals.map((n) => {
      const d = p.converged ? p.components.find((c) => c.name === n)?.dissolved : undefined
      return d === undefined ? '-' : scaledExp(d, scale.component(n))
    })
    rows.push([String(s.values[k]), fixed(p.pH, 3), ...(band ? [pHBand(p)] : []), exp(p.ionicStrength), ...dissolved, present, p.converged ? 'ok' : `failed: ${p.reason ?? ''}`])
  })
  const limits = (s.limits ?? []).flatMap((w) => [`limit: ${limitSentence(s, w)}`, ...(w.note ? [`  (${w.note})`] : [])])
  const note = band ? uncertaintyMethodText(s.points.find((p) => p.uncertainty)!) : null
  return [model.title, '', align(rows), ...(limits.length ? ['', ...limits] : []), ...(note ? ['', note] : [])].join('\n')
}

/** A map, one line a cell (row after row): both axes' values, pH, I, the dissolved totals, the solids present, the status. */
export function formatMapTable(model: Model, m: MapAnswer, scale: UnitScale = MOLAR_SCALE): string {
  const label = (a: MapAxis) => (a.component ? `${a.variable} ${a.component}` : a.variable)
  const solidNames = model.solids.map((x) => x.name)
  const totals = model.components.filter((c) => c.mode === 'total' && c.name !== 'H+').map((c) => c.name)
  const rows = [[label(m.y), label(m.x), 'pH', 'I mol/L', ...totals.map((n) => `${dissolvedText(n)} ${scale.componentUnit(n)}`), 'solids present', 'status']]
  m.y.values.forEach((yv, i) => m.x.values.forEach((xv, j) => {
    const p = mapCell(m, i, j)
    const present = p.solids.filter((x) => x.present && solidNames.includes(x.name)).map((x) => x.name).join(' ') || '-'
    const dissolved = totals.map((n) => {
      const d = p.converged ? p.components.find((c) => c.name === n)?.dissolved : undefined
      return d === undefined ? '-' : scaledExp(d, scale.component(n))
    })
    rows.push([String(yv), String(xv), p.converged ? fixed(p.pH, 3) : '-', p.converged ? exp(p.ionicStrength) : '-', ...dissolved, present, p.converged ? 'ok' : `failed: ${p.reason ?? ''}`])
  }))
  const failed = m.failedCells ? [`${m.failedCells} of ${m.x.values.length * m.y.values.length} cells did not converge`] : []
  return [model.title, `map over ${label(m.x)} (${m.x.values.length} points) by ${label(m.y)} (${m.y.values.length} points)`, '', align(rows), ...(failed.length ? ['', ...failed] : [])].join('\n')
}

/** A titration: the curve (volume in the file's unit, pH, dpH/dV, β, solids present) and its end points, or the dose. */
export function formatTitrationTable(model: Model, t: TitrationResult): string {
  const head = [model.title, `sample ${formatVolume(t.sampleVolumeL * 1000, t.unit)}`, '']
  if (!('points' in t)) {
    const lines = [...head, doseSentence(t)]
    if (t.point) lines.push('', formatResultTable(model, t.point))
    return lines.join('\n')
  }
  const solidNames = model.solids.map((x) => x.name)
  const unit = volumeInUnit(1, t.unit).unit
  const band = anyBand(t.points)
  const rows = [[`added ${unit}`, 'pH', ...(band ? ['pH 95 %'] : []), 'dpH/dV per mL', 'beta mol/L/pH', 'solids present', 'status']]
  t.points.forEach((p, k) => {
    const present = p.solids.filter((x) => x.present && solidNames.includes(x.name)).map((x) => x.name).join(' ') || '-'
    const slope = t.derivative[k]
    rows.push([
      String(Number(volumeInUnit(t.values[k], t.unit).value.toPrecision(10))), fixed(p.pH, 3), ...(band ? [pHBand(p)] : []),
      slope === null || slope === undefined ? '-' : exp(slope), p.bufferCapacity == null ? '-' : exp(p.bufferCapacity),
      present, p.converged ? 'ok' : `failed: ${p.reason ?? ''}`,
    ])
  })
  const limits = (t.limits ?? []).flatMap((w) => [`limit: ${limitSentence(titrationAsSweep(t), w)}`, ...(w.note ? [`  (${w.note})`] : [])])
  const note = band ? uncertaintyMethodText(t.points.find((p) => p.uncertainty)!) : null
  return [...head, align(rows), '', ...endPointSentences(t), ...limits, ...(note ? ['', note] : [])].join('\n')
}
