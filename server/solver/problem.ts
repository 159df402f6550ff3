/**
 * The numeric form of a model: typed arrays the Newton loop reads without
 * allocating. Building it also checks the model, so a malformed one becomes a
 * message instead of a NaN further down.
 */
import type { Model } from '../../shared/poise/model'
import { ACTIVITY_DAVIES, ACTIVITY_DEBYE_HUCKEL, ACTIVITY_IDEAL, type ActivityCode } from './activity'
import { ionSizeAngstrom } from '../../shared/poise/ionSize'
import { MIN_NONZERO_TOTAL } from '../../shared/poise/limits'
import { debyeHuckelA, debyeHuckelB } from './physics'
import { vantHoff } from '../../shared/poise/thermo'

/** Component roles in the equations. */
export const MODE_TOTAL = 0 // unknown, mass balance
export const MODE_BALANCE = 1 // unknown, charge balance
export const MODE_FIXED_CONCENTRATION = 2 // `free`: concentration known, activity follows γ
export const MODE_FIXED_ACTIVITY = 3 // `pH`, `pressure`, `excess`
export const MODE_ABSENT = 4 // total 0 and every species holds it positively: nothing of it exists

/** Smallest magnitude of a non-zero total, mol/L: one limit with the language's (shared/poise/limits.ts), so the checker refuses what the solver would. */
export { MIN_NONZERO_TOTAL }

/** log10 activity given to an absent component: far enough below anything representable. */
export const ABSENT_LOG_ACTIVITY = -400

export interface Problem {
  model: Model
  nc: number
  nsp: number
  nsol: number
  ngas: number
  /** Aqueous species kept (indices into model.species). */
  speciesIndex: Int32Array
  nu: Float64Array // nsp × nc
  /** The same stoichiometry by rows of nonzeros: species i uses entries nzStart[i] … nzStart[i+1]−1. */
  nzStart: Int32Array
  nzComponent: Int32Array
  nzNu: Float64Array
  /** The same by columns: component j appears in species colSpecies[colStart[j] … colStart[j+1]−1]. */
  colStart: Int32Array
  colSpecies: Int32Array
  colNu: Float64Array
  logK: Float64Array
  charge: Float64Array
  z2: Float64Array
  ionSize: Float64Array
  /** Aqueous species index (into the kept species) of each component's free form, or −1. */
  componentSpecies: Int32Array
  mode: Int8Array
  /** Mass-balance total, mol/L (MODE_TOTAL). */
  total: Float64Array
  /** log10 of the fixed concentration (free) or activity (pH, pressure, excess). */
  fixedLog: Float64Array
  solidNu: Float64Array // nsol × nc
  solidLogK: Float64Array
  suppressed: Uint8Array
  gasNu: Float64Array // ngas × nc
  gasLogK: Float64Array
  activity: ActivityCode
  temperatureC: number
  A: number
  B: number
  /** √I when ionic strength is held fixed, else −1. */
  fixedRootI: number
  hIndex: number
}

const KELVIN_SAFE = 273.15

const finite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v)

function checkFormation(what: string, nu: unknown, logK: unknown, nc: number): string | null {
  if (!Array.isArray(nu) || nu.length !== nc || !nu.every(finite)) {
    return `${what} has a stoichiometry that does not match the ${nc} components`
  }
  if (!finite(logK)) return `${what} has no finite formation constant`
  return null
}

/** Every defect of the model that would make the equations meaningless, or null. */
function modelDefect(model: Model): string | null {
  if (!model || !Array.isArray(model.components) || !Array.isArray(model.species)) {
    return 'the model has no components or species'
  }
  const nc = model.components.length
  if (nc === 0) return 'the model declares no component'
  if (!finite(model.temperatureC) || model.temperatureC <= -KELVIN_SAFE) return 'the temperature is not a number above absolute zero'
  if (!finite(model.refTemperatureC)) return 'the reference temperature of the constants is not a number'
  for (const c of model.components) {
    if (!finite(c.value)) return `component ${c.name} has no numeric value`
    if (c.mode === 'total' && c.value !== 0 && Math.abs(c.value) < MIN_NONZERO_TOTAL) {
      return `the total of ${c.name} (${c.value.toExponential(2)} mol/L) is closer to 0 than ${MIN_NONZERO_TOTAL} mol/L, beyond what the arithmetic can resolve; give 0 to leave it out`
    }
    if ((c.mode === 'free' || c.mode === 'pressure') && c.value <= 0) {
      return `component ${c.name} must have a positive ${c.mode === 'free' ? 'free concentration' : 'pressure'}`
    }
  }
  for (const s of model.species) {
    const d = checkFormation(`species ${s.name}`, s.nu, s.logK, nc)
    if (d) return d
  }
  for (const s of model.solids ?? []) {
    const d = checkFormation(`solid ${s.name}`, s.nu, s.logK, nc)
    if (d) return d
  }
  for (const g of model.gases ?? []) {
    const d = checkFormation(`gas ${g.name}`, g.nu, g.logK, nc)
    if (d) return d
  }
  if (model.fixedIonicStrength !== null && model.fixedIonicStrength !== undefined
    && (!finite(model.fixedIonicStrength) || model.fixedIonicStrength < 0)) {
    return 'the fixed ionic strength must be a non-negative number'
  }
  return null
}


function modeCode(mode: string): number {
  switch (mode) {
    case 'total': return MODE_TOTAL
    case 'balance': return MODE_BALANCE
    case 'free': return MODE_FIXED_CONCENTRATION
    default: return MODE_FIXED_ACTIVITY
  }
}

/** Builds the numeric problem, or returns why the model cannot be solved. */
export function buildProblem(model: Model): { problem: Problem } | { error: string } {
  const defect = modelDefect(model)
  if (defect) return { error: `The model cannot be solved: ${defect}.` }
  const nc = model.components.length
  const aqueousComponent = (j: number | null) => j === null || model.components[j]?.phase === 'aq'
  const kept = model.species
    .map((s, i) => ({ s, i }))
    .filter(({ s }) => aqueousComponent(s.componentIndex))
  const nsp = kept.length
  const solids = model.solids ?? []
  const gases = model.gases ?? []
  const p: Problem = {
    model, nc, nsp, nsol: solids.length, ngas: gases.length,
    speciesIndex: Int32Array.from(kept.map((k) => k.i)),
    nu: new Float64Array(nsp * nc),
    nzStart: new Int32Array(nsp + 1),
    nzComponent: new Int32Array(0),
    nzNu: new Float64Array(0),
    colStart: new Int32Array(nc + 1),
    colSpecies: new Int32Array(0),
    colNu: new Float64Array(0),
    logK: new Float64Array(nsp),
    charge: new Float64Array(nsp),
    z2: new Float64Array(nsp),
    ionSize: new Float64Array(nsp),
    componentSpecies: new Int32Array(nc).fill(-1),
    mode: new Int8Array(nc),
    total: new Float64Array(nc),
    fixedLog: new Float64Array(nc),
    solidNu: new Float64Array(solids.length * nc),
    solidLogK: new Float64Array(solids.length),
    suppressed: new Uint8Array(solids.length),
    gasNu: new Float64Array(gases.length * nc),
    gasLogK: new Float64Array(gases.length),
    activity: model.activity === 'davies' ? ACTIVITY_DAVIES
      : model.activity === 'debye-huckel' ? ACTIVITY_DEBYE_HUCKEL : ACTIVITY_IDEAL,
    temperatureC: model.temperatureC,
    A: 0, B: 0,
    fixedRootI: model.fixedIonicStrength == null ? -1 : Math.sqrt(model.fixedIonicStrength),
    hIndex: model.components.findIndex((c) => c.name === 'H+'),
  }
  kept.forEach(({ s }, i) => {
    for (let j = 0; j < nc; j++) p.nu[i * nc + j] = s.nu[j]
    p.logK[i] = s.logK
    p.charge[i] = s.charge
    p.z2[i] = s.charge * s.charge
    // The compiler writes the ion size it chose into the model; a model stored before it did takes the built-in default.
    p.ionSize[i] = typeof s.ionSize === 'number' && Number.isFinite(s.ionSize) && s.ionSize > 0 ? s.ionSize : ionSizeAngstrom(s.name, s.charge)
    if (s.componentIndex !== null && s.componentIndex >= 0 && s.componentIndex < nc) p.componentSpecies[s.componentIndex] = i
  })
  const nzComponent: number[] = []
  const nzNu: number[] = []
  for (let i = 0; i < nsp; i++) {
    p.nzStart[i] = nzComponent.length
    for (let j = 0; j < nc; j++) if (p.nu[i * nc + j] !== 0) { nzComponent.push(j); nzNu.push(p.nu[i * nc + j]) }
  }
  p.nzStart[nsp] = nzComponent.length
  p.nzComponent = Int32Array.from(nzComponent)
  p.nzNu = Float64Array.from(nzNu)
  const colSpecies: number[] = []
  const colNu: number[] = []
  for (let j = 0; j < nc; j++) {
    p.colStart[j] = colSpecies.length
    for (let i = 0; i < nsp; i++) if (p.nu[i * nc + j] !== 0) { colSpecies.push(i); colNu.push(p.nu[i * nc + j]) }
  }
  p.colStart[nc] = colSpecies.length
  p.colSpecies = Int32Array.from(colSpecies)
  p.colNu = Float64Array.from(colNu)
  solids.forEach((s, k) => {
    for (let j = 0; j < nc; j++) p.solidNu[k * nc + j] = s.nu[j]
    p.solidLogK[k] = s.logK
    p.suppressed[k] = s.suppressed ? 1 : 0
  })
  gases.forEach((g, k) => {
    for (let j = 0; j < nc; j++) p.gasNu[k * nc + j] = g.nu[j]
    p.gasLogK[k] = g.logK
  })
  model.components.forEach((c, j) => setComponent(p, j, c.mode, c.value))
  setActivityParameters(p, model.temperatureC)
  return { problem: p }
}

/** Gives component j a spec (used by sweeps to hold pH, a total or a pressure). */
export function setComponent(p: Problem, j: number, mode: string, value: number): void {
  p.mode[j] = modeCode(mode)
  p.total[j] = 0
  p.fixedLog[j] = 0
  if (mode === 'total') {
    p.total[j] = value
    if (value === 0 && holdsOnlyPositively(p, j)) {
      p.mode[j] = MODE_ABSENT
      p.fixedLog[j] = ABSENT_LOG_ACTIVITY
    }
  } else if (mode === 'free' || mode === 'pressure') {
    p.fixedLog[j] = Math.log10(value)
  } else if (mode === 'pH') {
    p.fixedLog[j] = -value
  }
}

function holdsOnlyPositively(p: Problem, j: number): boolean {
  for (let i = 0; i < p.nsp; i++) if (p.nu[i * p.nc + j] < 0) return false
  for (let s = 0; s < p.nsol; s++) if (p.solidNu[s * p.nc + j] < 0) return false
  return true
}

function setActivityParameters(p: Problem, tC: number): void {
  p.temperatureC = tC
  p.A = debyeHuckelA(tC)
  p.B = debyeHuckelB(tC)
}

/** Moves every constant to temperature tC from its reference value by van 't Hoff, and A, B with it. */
export function setTemperature(p: Problem, tC: number): void {
  const m = p.model
  for (let i = 0; i < p.nsp; i++) {
    const s = m.species[p.speciesIndex[i]]
    p.logK[i] = vantHoff(s.logKRef, s.dH ?? 0, tC, m.refTemperatureC)
  }
  m.solids.forEach((s, k) => { p.solidLogK[k] = vantHoff(s.logKRef, s.dH ?? 0, tC, m.refTemperatureC) })
  m.gases.forEach((g, k) => { p.gasLogK[k] = vantHoff(g.logKRef, g.dH ?? 0, tC, m.refTemperatureC) })
  setActivityParameters(p, tC)
}
