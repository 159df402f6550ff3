/**
 * Turns the solved state into the Result JSON: every aqueous species, every
 * solid with its saturation index, gases, component totals, residuals and
 * warnings. Nothing here may put NaN or Infinity into the output.
 */
import type { ComponentResult, GasResult, Result, SolidResult, SpeciesResult } from '../../shared/types/result'
import { ACTIVITY_RANGE_LIMIT } from './activity'
import { computeResiduals, computeSpecies, speciesAreOf } from './equations'
import type { SolverState, Workspace } from './workspace'
import { saturationIndex } from './phases'
import { MODE_ABSENT, MODE_FIXED_ACTIVITY, type Problem } from './problem'

/** Finite stand-in for values that overflowed or are undefined (never NaN in JSON). */
const safe = (v: number, fallback = 0) => (Number.isFinite(v) ? v : fallback)

/** A log10 that is a number, or null (the caller gives the reason; never a made-up number such as −400). */
const logOrNull = (v: number) => (Number.isFinite(v) ? v : null)

export interface ReportInput {
  converged: boolean
  iterations: number
  reason?: string
  notes: string[]
}

export function buildResult(ws: Workspace, state: SolverState, info: ReportInput): Result {
  const p = ws.p
  const m = p.model
  ws.layout(state)
  // The problem does not change between the last Newton evaluation and here.
  if (!speciesAreOf(ws, state)) computeSpecies(ws, state)
  computeResiduals(ws, state, ws.F, ws.scale)
  const equations: { name: string; scaled: number }[] = []
  let maxScaled = 0
  for (let r = 0; r < ws.dim; r++) {
    const v = safe(Math.abs(ws.F[r] / ws.scale[r]), 1)
    equations.push({ name: ws.rowName(r), scaled: v })
    maxScaled = Math.max(maxScaled, v)
  }
  const species: SpeciesResult[] = new Array(p.nsp)
  let anyAbsent = false
  for (let j = 0; j < p.nc; j++) if (p.mode[j] === MODE_ABSENT) anyAbsent = true
  let ionic = 0
  // Dissolved amount of each component, summed over the nonzero stoichiometry only.
  const dissolvedOf = new Float64Array(p.nc)
  for (let i = 0; i < p.nsp; i++) {
    const s = m.species[p.speciesIndex[i]]
    const c = ws.c[i]
    for (let e = p.nzStart[i]; e < p.nzStart[i + 1]; e++) dissolvedOf[p.nzComponent[e]] += p.nzNu[e] * c
    const gamma = Math.exp(ws.g[i] * Math.LN10)
    ionic += 0.5 * p.z2[i] * c
    const absent = anyAbsent ? absentIn(p, p.nu, i) : null
    const log10 = absent === null ? logOrNull(ws.lc[i]) : null
    const entry: SpeciesResult = {
      name: s.name, charge: s.charge,
      concentration: absent === null ? safe(c) : 0, log10,
      activity: absent === null ? safe(c * gamma) : 0, gamma: safe(gamma, 1),
    }
    if (log10 === null) entry.none = absent ?? 'the concentration is not a finite number'
    species[i] = entry
  }
  const ionicStrength = p.fixedRootI >= 0 ? p.fixedRootI * p.fixedRootI : ionic
  const solids: SolidResult[] = m.solids.map((s, k) => {
    const amount = state.active[k] === 1 ? safe(state.n[k]) : 0
    const absent = anyAbsent ? absentIn(p, p.solidNu, k) : null
    const si = absent === null ? logOrNull(saturationIndex(p, state.x, k)) : null
    const entry: SolidResult = { name: s.name, present: state.active[k] === 1, amount, precipitated: amount, saturationIndex: si }
    if (s.suppressed) entry.suppressed = true
    if (si === null) entry.none = absent ?? 'the saturation index is not a finite number'
    return entry
  })
  const components: ComponentResult[] = m.components.map((comp, j) => {
    const dissolved = dissolvedOf[j]
    let inSolids = 0
    for (let k = 0; k < p.nsol; k++) if (state.active[k]) inSolids += p.solidNu[k * p.nc + j] * state.n[k]
    // Held activities (pH, pressure, excess) are reported as such; the rest as concentrations.
    const own = p.componentSpecies[j]
    const activity = p.mode[j] === MODE_ABSENT ? 0 : Math.exp(state.x[j] * Math.LN10)
    const concentration = own >= 0 ? species[own].concentration : null
    const free = concentration !== null && p.mode[j] !== MODE_FIXED_ACTIVITY ? concentration : activity
    const entry: ComponentResult = { name: comp.name, mode: comp.mode, total: safe(dissolved + inSolids), free: safe(free), dissolved: safe(dissolved) }
    if (concentration !== null) entry.freeConcentration = concentration
    entry.freeActivity = safe(activity)
    return entry
  })
  m.components.forEach((comp, j) => {
    if (comp.mode === 'excess' && p.mode[j] === MODE_FIXED_ACTIVITY && !solids.some((s) => s.name === comp.name)) {
      const dissolved = components[j].dissolved ?? 0
      solids.push({ name: comp.name, present: true, amount: dissolved, dissolved, saturationIndex: 0 })
    }
  })
  const gases: GasResult[] = m.gases.map((g, k) => {
    let l = p.gasLogK[k]
    for (let j = 0; j < p.nc; j++) l += p.gasNu[k * p.nc + j] * state.x[j]
    const absent = anyAbsent ? absentIn(p, p.gasNu, k) : null
    const log10 = absent === null ? logOrNull(l) : null
    const entry: GasResult = { name: g.name, pressure: log10 === null ? 0 : safe(Math.exp(l * Math.LN10)), log10 }
    if (log10 === null) entry.none = absent ?? 'the pressure is not a finite number'
    return entry
  })
  const warnings = [...info.notes, ...rangeWarnings(ws, ionicStrength)]
  const hasH = p.hIndex >= 0
  if (!hasH) warnings.push('The system has no H+ component, so pH is not defined (reported as 0).')
  const result: Result = {
    converged: info.converged,
    iterations: info.iterations,
    temperatureC: p.temperatureC,
    pH: hasH ? safe(-state.x[p.hIndex]) : 0,
    ionicStrength: safe(ionicStrength),
    species, solids, gases, components,
    residuals: { maxScaled, equations },
  }
  if (!info.converged) result.reason = info.reason ?? 'the solver stopped without closing every equation'
  if (warnings.length > 0) result.warnings = warnings
  return result
}

/**
 * Why row k of a stoichiometry (nu, by rows of nc) has no value: it holds a
 * component that is absent (total 0), or null when it holds none.
 */
function absentIn(p: Problem, nu: Float64Array, k: number): string | null {
  for (let j = 0; j < p.nc; j++) {
    if (p.mode[j] === MODE_ABSENT && nu[k * p.nc + j] !== 0) return `none: the total of ${p.model.components[j].name} is 0`
  }
  return null
}

function rangeWarnings(ws: Workspace, ionicStrength: number): string[] {
  const out: string[] = []
  const name = ws.p.model.activity
  if (name === 'davies' || name === 'debye-huckel') {
    const limit = ACTIVITY_RANGE_LIMIT[name]
    if (ionicStrength > limit) {
      out.push(`Ionic strength ${ionicStrength.toPrecision(3)} mol/L is above the usual range of the ${name} model (about ${limit} mol/L); activity coefficients are rough there.`)
    }
  } else if (ionicStrength > 0.01) {
    out.push(`Ionic strength ${ionicStrength.toPrecision(3)} mol/L with ideal activities: concentrations and activities differ noticeably above about 0.01 mol/L.`)
  }
  const t = ws.p.temperatureC
  if (t < 0 || t > 100) out.push(`Temperature ${t} °C is outside 0–100 °C, where the water properties behind the Debye–Hückel parameters hold.`)
  return out
}
