/**
 * `map VARIABLE from A to B (step D | points N) [log] by VARIABLE from A to B
 * (step D | points N) [log]`: two axes, each checked as a sweep is
 * (shared/poise/sweep.ts), then together: they must vary different things,
 * the grid must keep to SIZE_LIMITS.maxMapCells, and a map is the file's one study.
 */
import type { ModelComponent, ModelMap } from './model'
import type { Reporter } from './reporter'
import type { Statement } from './statements'
import { compileSweep } from './sweep'
import { formatNumber, SIZE_LIMITS } from './limits'
import { parseFormula, type Abbreviations } from './formula'

type MapStatement = Extract<Statement, { kind: 'map' }>

/** The component an axis sets ('H+' for pH; null for temperature). */
function setsComponent(axis: MapStatement['x'], abbreviations?: Abbreviations): string | null {
  if (axis.variable === 'pH') return 'H+'
  if (axis.variable === 'temperature') return null
  const name = axis.target?.image ?? null
  return name === null ? null : (parseFormula(name, abbreviations).formula?.name ?? name)
}

function axisText(axis: MapStatement['x']): string {
  return axis.target ? `${axis.variable} ${axis.target.image}` : axis.variable
}

/**
 * The model's map, or null after reporting why it cannot run. `others`: the
 * file's `sweep` and `titrate` lines (a file holds one study).
 */
export function compileMap(s: MapStatement, components: ModelComponent[], others: { sweep?: Statement; titrate?: Statement }, report: Reporter, abbreviations?: Abbreviations): ModelMap | null {
  let ok = true
  if (others.sweep) {
    report.error('P094', 'a file holds one study: a `map` already sweeps two variables, so remove the `sweep` line (or make it an axis of the map)', s.keyword)
    ok = false
  }
  if (others.titrate) {
    report.error('P094', 'a file holds one study, a map or a titration: remove the `map` line or the `titrate` line', s.keyword)
    ok = false
  }
  const a = setsComponent(s.x, abbreviations)
  const b = setsComponent(s.y, abbreviations)
  const sameThing = s.x.variable === 'temperature' ? s.y.variable === 'temperature' : a !== null && a === b
  if (sameThing) {
    const what = s.x.variable === s.y.variable ? (s.x.variable === 'temperature' ? 'the temperature' : axisText(s.x)) : `${a} (${axisText(s.x)} and ${axisText(s.y)} both set it)`
    report.error('P094', `both axes of the map vary ${what}: give the second axis (after \`by\`) another variable than ${axisText(s.x)}`, s.y.variableTok)
    return null
  }
  const x = compileSweep(s.x, components, report, abbreviations, 'map axis')
  const y = compileSweep(s.y, components, report, abbreviations, 'map axis')
  if (!x || !y || !ok) return null
  const cells = x.values.length * y.values.length
  if (cells > SIZE_LIMITS.maxMapCells) {
    report.error('P094', `this map has ${x.values.length} × ${y.values.length} = ${formatNumber(cells)} cells; it may have at most ${formatNumber(SIZE_LIMITS.maxMapCells)}: use fewer points on an axis`, { from: s.x.from, to: s.y.to })
    return null
  }
  return { x, y, line: report.lineOf(s.keyword.from) }
}
