/**
 * Seeded random aqueous systems for the solver's robustness tests: one to
 * three metals (charge 2 or 3, hydrolysis, complexes, sometimes a hydroxo
 * dimer), one or two ligands with one to three protonation steps, and per
 * metal a set of competing solids — hydroxide, plain salt, an acid salt that
 * holds H+ positively, hydroxy-salts with 2–4 metal atoms — with H+ given as
 * `pH`, `balance` or `total`, ideal or Davies activities. The constants are
 * invented (drawn from ranges typical of such systems, common practice);
 * only the equations matter. `checkAnswer` judges an answer independently of
 * the solver (verify.ts, 40-digit arithmetic).
 */
import type { Model } from '../../../shared/poise/model'
import type { Result } from '../../../shared/types/result'
import { buildModel, hydroxide, type ComponentSpec, type FormationSpec } from './modelBuilder'
import { hasNonFinite, verifyResult } from './verify'

/** mulberry32: a small seeded generator of uniform numbers in [0, 1). */
export function rng(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b))

export interface RandomSystem { seed: number; model: Model; describe: string }

export function randomSystem(seed: number): RandomSystem {
  const r = rng(seed)
  const U = (lo: number, hi: number) => lo + (hi - lo) * r()
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)]
  const protonMode = pick(['pH', 'balance', 'total'] as const)
  const activity = pick(['ideal', 'davies'] as const)
  const salt = 10 ** U(-4, -1.3)
  const components: ComponentSpec[] = [
    { name: 'H+', charge: 1, mode: protonMode, value: protonMode === 'pH' ? U(2, 12) : 0 },
    { name: 'Na+', charge: 1, mode: 'total', value: salt },
    { name: 'Cl-', charge: -1, mode: 'total', value: salt },
  ]
  const species: FormationSpec[] = [hydroxide()]
  const solids: FormationSpec[] = []
  const ligands: { name: string; z: number; steps: number; total: number }[] = []
  const nLig = 1 + Math.floor(r() * 2)
  let protonCapacity = 0
  for (let k = 0; k < nLig; k++) {
    const name = `L${k}`
    const z = 1 + Math.floor(r() * 3)
    const steps = Math.max(1, z - Math.floor(r() * 2))
    const total = 10 ** U(-5, -1.5)
    components.push({ name, charge: -z, mode: 'total', value: total })
    let logK = 0
    let pKa = U(8, 12.5)
    for (let h = 1; h <= steps; h++) {
      logK += pKa
      species.push({ name: `H${h}${name}`, charge: h - z, nu: { 'H+': h, [name]: 1 }, logK })
      pKa -= U(2, 5)
    }
    ligands.push({ name, z, steps, total })
    protonCapacity += steps * total
  }
  const nMet = 1 + Math.floor(r() * 3)
  const metalDescription: string[] = []
  for (let k = 0; k < nMet; k++) {
    const M = `M${k}`
    const zM = pick([2, 2, 3])
    components.push({ name: M, charge: zM, mode: 'total', value: 10 ** (r() < 0.2 ? U(-12, -6) : U(-5, -1.5)) })
    const hydrolysis = zM === 3 ? U(-4, -2) : U(-11, -6)
    species.push({ name: `${M}OH`, charge: zM - 1, nu: { [M]: 1, 'H+': -1 }, logK: hydrolysis })
    species.push({ name: `${M}(OH)2`, charge: zM - 2, nu: { [M]: 1, 'H+': -2 }, logK: 2 * hydrolysis - U(0, 3) })
    if (r() < 0.3) species.push({ name: `${M}2(OH)2`, charge: 2 * zM - 2, nu: { [M]: 2, 'H+': -2 }, logK: 2 * hydrolysis + U(1, 5) })
    const lig = pick(ligands)
    species.push({ name: `${M}${lig.name}`, charge: zM - lig.z, nu: { [M]: 1, [lig.name]: 1 }, logK: U(1, 10) })
    if (r() < 0.5) species.push({ name: `${M}${lig.name}2`, charge: zM - 2 * lig.z, nu: { [M]: 1, [lig.name]: 2 }, logK: U(2, 16) })
    // Solubility products per metal atom drawn from overlapping ranges, so the solids compete.
    const made: string[] = []
    if (r() < 0.8) {
      solids.push({ name: `${M}(OH)${zM}(s)`, nu: { [M]: 1, 'H+': -zM }, logK: (zM === 3 ? U(30, 40) : U(10, 20)) - zM * 14 })
      made.push('hydroxide')
    }
    // Plain salt M_a L_b.
    const g = gcd(zM, lig.z)
    const a = lig.z / g
    const b = zM / g
    solids.push({ name: `${M}${a}${lig.name}${b}(s)`, nu: { [M]: a, [lig.name]: b }, logK: a * U(4, 12) })
    made.push('salt')
    // Acid salt M(HL)_c: holds H+ positively.
    if (lig.z >= 2 && r() < 0.5) {
      const zHL = lig.z - 1
      const g2 = gcd(zM, zHL)
      const a2 = zHL / g2
      const b2 = zM / g2
      solids.push({ name: `${M}${a2}(H${lig.name})${b2}(s)`, nu: { [M]: a2, [lig.name]: b2, 'H+': b2 }, logK: a2 * U(4, 12) + b2 * U(8, 11) })
      made.push('acid salt')
    }
    // Hydroxy-salts with 2–4 metal atoms: M_k L_m (OH)_n, k zM = m zL + n, n ≥ 1.
    const nHydroxy = Math.floor(r() * 3)
    for (let h = 0; h < nHydroxy; h++) {
      const atoms = 2 + Math.floor(r() * 3)
      const mMax = Math.floor((atoms * zM - 1) / lig.z)
      if (mMax < 1) continue
      const m = 1 + Math.floor(r() * mMax)
      const n = atoms * zM - m * lig.z
      const name = `${M}${atoms}${lig.name}${m}(OH)${n}(s)`
      if (solids.some((s) => s.name === name)) continue
      solids.push({ name, nu: { [M]: atoms, [lig.name]: m, 'H+': -n }, logK: atoms * U(6, 14) - n * 14 })
      made.push(`hydroxy-salt ×${atoms}`)
    }
    metalDescription.push(`${M}(${zM}+: ${made.join(', ')})`)
  }
  if (protonMode === 'total') {
    // Some of the ligands' protons, plus a strong acid or base.
    components[0].value = U(0, 1) * protonCapacity + (r() < 0.5 ? -1 : 1) * 10 ** U(-7, -2.5)
  }
  const model = buildModel({ activity, components, species, solids })
  const describe = `seed ${seed}: H+ ${protonMode}, ${activity}, ligands ${ligands.map((l) => `${l.name}${-l.z}/${l.steps}H`).join(' ')}, metals ${metalDescription.join('; ')}`
  return { seed, model, describe }
}

/** Tolerances of the independent check. */
export const CHECK = { balance: 1e-9, presentSI: 1e-8, supersaturation: 1e-8 } as const

/**
 * What is wrong with an answer, or null when it is a verified equilibrium:
 * converged, every mass and charge balance closed again from the
 * stoichiometry, no present solid at a negative amount or off saturation, no
 * absent solid supersaturated, no NaN or infinity anywhere.
 */
export function checkAnswer(model: Model, result: Result): string | null {
  if (hasNonFinite(result)) return 'NaN or Infinity in the answer'
  if (!result.converged) return `not converged: ${result.reason}`
  const v = verifyResult(model, result)
  if (v.negativeAmount) return 'a present solid has a negative amount'
  if (!(v.worstBalance < CHECK.balance)) return `balance of ${v.worstBalanceName} off by ${v.worstBalance.toExponential(2)}`
  if (!(v.worstPresentSI < CHECK.presentSI)) return `a present solid is off saturation by ${v.worstPresentSI.toExponential(2)}`
  if (!(v.worstSupersaturation <= CHECK.supersaturation)) return `an absent solid is supersaturated (SI ${v.worstSupersaturation.toExponential(2)})`
  return null
}
