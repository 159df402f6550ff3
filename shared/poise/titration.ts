/**
 * `sample volume`, `titrant` and `titrate`: the checks and the titration
 * of the model. Volumes of the model are in mL for the added titrant (as the
 * answer reports them) and in L for the sample.
 */
import type { ModelComponent, ModelTitrant, ModelTitration } from './model'
import type { Reporter } from './reporter'
import type { Statement, Quantity, Tok } from './statements'
import type { Known } from './reactions'
import { parseFormula, type Abbreviations } from './formula'
import { unitInfo, UNIT_HINTS } from './units'
import { checkRange, formatNumber, SIZE_LIMITS } from './limits'

type SampleStatement = Extract<Statement, { kind: 'sampleVolume' }>
type TitrantStatement = Extract<Statement, { kind: 'titrant' }>
type TitrateStatement = Extract<Statement, { kind: 'titrate' }>

const round = (x: number) => Number(x.toPrecision(12))

/**
 * A titrant whose charges sum to less than this share of Σ|z|·c is
 * electroneutral: concentrations are written to four significant figures
 * (0.1000 mol/L), and a mass unit goes through a molar mass of five.
 */
export const NEUTRALITY_TOLERANCE = 1e-4

export interface TitrationStatements {
  sample: SampleStatement | undefined
  titrants: TitrantStatement[]
  titrate: TitrateStatement | undefined
  sweep: Extract<Statement, { kind: 'sweep' }> | undefined
}

/** A volume in litres, or null after reporting why not. */
function litres(q: Quantity, fallbackUnit: Tok | null, what: string, report: Reporter): number | null {
  const unit = q.unit ?? fallbackUnit
  if (!unit) { report.error('P050', `expected ${UNIT_HINTS.volume} after ${q.number.image}`, q.number); return null }
  const info = unitInfo(unit.image)
  if (!info || info.dimension !== 'volume') {
    if (!q.unit) return null // the unit borrowed from the other end is reported there
    report.error('P050', `${unit.image} is not ${UNIT_HINTS.volume}`, q.unit ?? q.number)
    return null
  }
  if (q.value < 0) { report.error('P052', `${what} cannot be negative: a volume is 0 or more`, q.number); return null }
  const v = q.value * info.factor
  return checkRange(report, 'volume', v, q.number, { what }) ? v : null
}

export function compileTitration(s: TitrationStatements, components: ModelComponent[], known: Map<string, Known>, report: Reporter, abbreviations?: Abbreviations): ModelTitration | null {
  const { sample, titrants, titrate, sweep } = s
  if (!titrate) {
    const first = sample ?? titrants[0]
    if (first) report.warning('W110', '`sample volume` and `titrant` do nothing without a `titrate` line: add `titrate from 0 to 20 mL step 0.1` or `titrate to pH 7`', first.keyword)
    return null
  }
  let ok = true
  if (sweep) {
    report.error('P090', 'a file holds one study, a titration or a sweep: remove the `sweep` line or the `titrate` line', titrate.keyword)
    ok = false
  }
  if (!sample) {
    report.error('P090', 'a titration needs the volume of the sample: add `sample volume N mL`', titrate.keyword)
    ok = false
  }
  if (titrants.length === 0) {
    report.error('P090', 'a titration needs its titrant: add one `titrant F N mol/L` line per species it holds (such as `titrant Na+ 0.1 mol/L` and `titrant OH- 0.1 mol/L`)', titrate.keyword)
    ok = false
  }
  const held = components.find((c) => c.mode === 'pH')
  if (held) {
    report.error('P090', `the pH is held by \`component ${held.name} pH\`, so no titrant can move it: write \`component ${held.name} balance\``, titrate.keyword)
    ok = false
  }

  let sampleVolumeL: number | null = null
  if (sample) {
    sampleVolumeL = litres(sample.quantity, null, 'the sample volume', report)
    if (sampleVolumeL === 0) { report.error('P052', 'the sample volume must be above 0', sample.quantity.number); sampleVolumeL = null }
  }
  if (sampleVolumeL === null) ok = false

  // The titrant: its species, what they bring to the components, its charge.
  const titrant: ModelTitrant[] = []
  const titrantTotals = new Array<number>(components.length).fill(0)
  let net = 0
  let gross = 0
  const seen = new Set<string>()
  for (const t of titrants) {
    const parsed = parseFormula(t.formula.image, abbreviations)
    const f = parsed.formula
    if (!f) {
      const p = parsed.problem
      report.error(p?.code ?? 'P010', p?.message ?? `${t.formula.image} is not a formula`, p ? { from: t.formula.from + p.from, to: t.formula.from + Math.max(p.to, p.from + 1) } : t.formula)
      ok = false
      continue
    }
    const k = known.get(f.name)
    if (!k || f.name === 'H2O' || f.phase === 'g') {
      const asComponent = f.phase === 'aq' ? `; a component that only the titrant brings is declared in the sample as \`component ${f.name} total 0 mol/L\`` : ''
      report.error('P092', `${f.name} is no species this system can express${f.name === 'H2O' ? ' (water is the solvent)' : f.phase === 'g' ? ' in the titrant (a gas)' : ''}: name a component or a species a reaction defines${asComponent}`, t.formula)
      ok = false
      continue
    }
    if (seen.has(f.name)) { report.error('P031', `${f.name} is in the titrant twice: keep one line`, t.formula); ok = false; continue }
    seen.add(f.name)
    const q = t.quantity
    const info = q.unit ? unitInfo(q.unit.image) : null
    let c: number | null = null
    if (!q.unit || !info || (info.dimension !== 'concentration' && info.dimension !== 'mass-concentration')) {
      report.error('P050', q.unit ? `${q.unit.image} is not ${UNIT_HINTS.concentration}` : `expected ${UNIT_HINTS.concentration} after ${q.number.image}`, q.unit ?? q.number)
    } else if (q.value < 0) {
      report.error('P052', `the concentration of ${f.name} in the titrant cannot be negative`, q.number)
    } else if (info.dimension === 'mass-concentration') {
      const molarMass = k.formula.molarMass ?? 0
      if (!(molarMass > 0)) report.error('P051', `no molar mass for ${f.name}: give its concentration in mol/L`, q.unit)
      else c = (q.value * info.factor) / molarMass
    } else c = q.value * info.factor
    if (c === null || !checkRange(report, 'concentration', c, q.number, { what: `the concentration of ${f.name} in the titrant` })) { ok = false; continue }
    const nu = k.formation.nu
    for (let j = 0; j < components.length; j++) {
      if (!nu[j]) continue
      const comp = components[j]!
      if (comp.mode !== 'total' && comp.mode !== 'balance' && comp.mode !== 'pH') {
        report.error('P092', `${f.name} brings ${comp.name}, which the sample holds at a fixed ${comp.mode === 'free' ? 'free concentration' : comp.mode === 'pressure' ? 'pressure' : 'activity (excess solid)'}, so the titrant could not change it: declare ${comp.name} with \`total\``, t.formula)
        ok = false
      }
      titrantTotals[j] += c * nu[j]!
    }
    net += k.formula.charge * c
    gross += Math.abs(k.formula.charge) * c
    titrant.push({ species: f.name, concentration: c, line: report.lineOf(t.from) })
  }
  if (titrant.length === titrants.length && titrant.length > 0 && Math.abs(net) > NEUTRALITY_TOLERANCE * gross) {
    const sign = net > 0 ? '+' : '−'
    report.error('P093', `the titrant is not electroneutral: its charges sum to ${sign}${formatNumber(Math.abs(net))} mol/L (Σ z·c of its species): add a ${net > 0 ? 'negative' : 'positive'} counter-ion of that much charge or correct a concentration`, titrants[0]!.keyword)
    ok = false
  }

  // The study: a curve of added volumes, or the dose to a target pH.
  let values: number[] | null = null
  let targetPH: number | null = null
  let unit = 'mL'
  if (titrate.targetPH) {
    targetPH = titrate.targetPH.value
    if (!checkRange(report, 'pH', targetPH, titrate.targetPH.number, { what: 'the target pH' })) ok = false
    unit = sample?.quantity.unit?.image ?? 'mL'
  } else {
    const start = titrate.start!
    const end = titrate.end!
    const unitTok = end.unit ?? start.unit
    if (unitTok) unit = unitTok.image
    const from = litres(start, unitTok, "the titration's first volume", report)
    const to = litres(end, unitTok, "the titration's last volume", report)
    if (from === null || to === null) return null
    if (!(to > from)) {
      report.error('P052', `a titration adds titrant: its last volume (${end.number.image}) must be above its first (${start.number.image})`, end.number)
      return null
    }
    let volumes: number[]
    if (titrate.points) {
      const n = titrate.points.value
      if (!Number.isInteger(n) || n < 2 || n > SIZE_LIMITS.maxSweepPoints) {
        report.error('P080', `points must be a whole number from 2 to ${SIZE_LIMITS.maxSweepPoints}, not ${formatNumber(n)}`, titrate.points.number)
        return null
      }
      volumes = Array.from({ length: n }, (_, i) => from + ((to - from) * i) / (n - 1))
    } else {
      const step = titrate.step!
      const stepUnit = step.unit ?? unitTok
      const info = stepUnit ? unitInfo(stepUnit.image) : null
      if (!stepUnit || !info || info.dimension !== 'volume') {
        report.error('P050', stepUnit ? `${stepUnit.image} is not ${UNIT_HINTS.volume}` : `expected ${UNIT_HINTS.volume} after ${step.number.image}`, step.unit ?? step.number)
        return null
      }
      if (!(step.value > 0)) {
        report.error('P052', `the step ${step.number.image} must be above 0: a titration adds titrant`, step.number)
        return null
      }
      const d = step.value * info.factor
      const ratio = (to - from) / d
      const count = Number.isFinite(ratio) ? Math.floor(ratio + 1e-9) + 1 : Infinity
      if (count > SIZE_LIMITS.maxSweepPoints || count < 2) {
        report.error('P080', count < 2
          ? `the step ${step.number.image} is larger than the titration: use a step below ${formatNumber((to - from) / info.factor)}`
          : `this titration has ${count <= 1e9 ? `${formatNumber(count)} points` : 'more than a billion points'}; it may have 2 to ${SIZE_LIMITS.maxSweepPoints}: use a larger step`, step.number)
        return null
      }
      volumes = Array.from({ length: count }, (_, i) => from + d * i)
    }
    values = volumes.map((v) => round(v * 1000))
  }
  if (!ok || sampleVolumeL === null) return null
  return { sampleVolumeL, titrant, titrantTotals, values, targetPH, unit, line: report.lineOf(titrate.from) }
}
