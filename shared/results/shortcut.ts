/**
 * The hand method beside the exact answer (the "shortcut check"): the
 * estimate a chemist makes with fractions of species at a fixed pH, and how
 * far it is from the exact answer. Definitions (the tests check these):
 *
 * - pH is held at the exact answer's pH; concentrations stand for
 *   activities (every γ taken as 1).
 * - The protonation fraction p(X) of a component X other than H+ is the
 *   fraction of X in its free form when only the species made of one X and
 *   H+ count: 1 / Σ β h^νH over them (the free form counts 1).
 * - α(X), the fraction of X in its free form, counts every species holding
 *   exactly one X, each other component Y held at its total times p(Y) (the
 *   ligand-in-excess assumption; a component whose free value or pressure is
 *   fixed is held at it); polynuclear species are left out, as by hand.
 * - The estimated free concentration is α(X) × X's dissolved total in the
 *   exact answer, so its error is that of the fraction alone.
 * - For a solid MaLb of two components (H+ aside), the conditional
 *   solubility is (Ksp / (a^a b^b α(M)^a α(L)^b))^(1/(a+b)) formula units a
 *   litre, with Ksp taken at the pH; the exact one is the smallest of the
 *   components' dissolved totals divided by their coefficients.
 * - factor = estimate / exact.
 */
import type { Model } from '../poise/model'
import type { Result, Shortcut } from '../types/result'

type ShortcutModel = Pick<Model, 'components' | 'species' | 'solids'>

const FIXED_MODES = new Set(['free', 'pressure', 'excess'])

/**
 * The model's stoichiometry as the shortcut reads it, once per model (a sweep
 * asks at every point): each species' nonzero coefficients in component
 * order, and by component the species holding it once — all of them, and
 * those made of it and H+ alone. With these a point costs about the number
 * of nonzeros, not components² × species.
 */
interface Layout {
  jH: number
  /** For species i: its components k with ν ≠ 0, in order, and those ν. */
  nzComponent: number[][]
  nzNu: number[][]
  /** For component j: the species with ν_j = 1. */
  once: number[][]
  /** For component j: the species with ν_j = 1 made of j and H+ only. */
  protonated: number[][]
}

const layouts = new WeakMap<ShortcutModel['species'], Layout>()

function layoutOf(model: ShortcutModel): Layout {
  let layout = layouts.get(model.species)
  if (layout) return layout
  const jH = model.components.findIndex((c) => c.name === 'H+')
  const n = model.components.length
  const once: number[][] = Array.from({ length: n }, () => [])
  const protonated: number[][] = Array.from({ length: n }, () => [])
  const nzComponent: number[][] = []
  const nzNu: number[][] = []
  model.species.forEach((s, i) => {
    const ks: number[] = []
    const vs: number[] = []
    s.nu.forEach((v, k) => { if (v !== 0) { ks.push(k); vs.push(v) } })
    nzComponent.push(ks)
    nzNu.push(vs)
    for (let j = 0; j < n; j++) {
      if (s.nu[j] !== 1) continue
      once[j].push(i)
      if (s.nu.every((v, k) => k === j || k === jH || v === 0)) protonated[j].push(i)
    }
  })
  layout = { jH, nzComponent, nzNu, once, protonated }
  layouts.set(model.species, layout)
  return layout
}

export function shortcutOf(model: ShortcutModel, result: Result): Shortcut | null {
  if (!result.converged || !Number.isFinite(result.pH)) return null
  const layout = layoutOf(model)
  const jH = layout.jH
  const h = Math.pow(10, -result.pH)
  const componentResult = new Map(result.components.map((c) => [c.name, c]))
  const protonation = (j: number) => protonationFraction(model, result.pH, j)
  /** What the hand method takes for the free amount of each component used as a ligand. */
  const ligand = model.components.map((c, k) => {
    const r = componentResult.get(c.name)
    if (!r || k === jH) return Number.NaN
    if (FIXED_MODES.has(c.mode)) return r.freeActivity ?? r.free
    return r.total * protonation(k)
  })
  const alpha = (j: number): number => {
    let sum = 0
    for (const i of layout.once[j]!) {
      const s = model.species[i]!
      let term = Math.pow(10, s.logK) * (jH >= 0 ? Math.pow(h, s.nu[jH] ?? 0) : 1)
      const ks = layout.nzComponent[i]!
      const vs = layout.nzNu[i]!
      for (let e = 0; e < ks.length; e++) {
        const k = ks[e]!
        if (k === j || k === jH) continue
        if (vs[e]! < 0) { term = Number.NaN; break }
        term *= Math.pow(ligand[k]!, vs[e]!)
      }
      if (Number.isFinite(term)) sum += term
    }
    return sum > 0 ? 1 / sum : Number.NaN
  }

  const alphas = new Map<string, number>()
  const components: Shortcut['components'] = []
  model.components.forEach((c, j) => {
    const r = componentResult.get(c.name)
    if (j === jH || c.phase !== 'aq' || !r || r.dissolved === undefined || !(r.dissolved > 0)) return
    const a = alpha(j)
    alphas.set(c.name, a)
    const freeExact = r.freeConcentration ?? r.free
    const freeEstimate = a * r.dissolved
    const entry = { name: c.name, alphaFree: a, freeEstimate, freeExact, factor: freeEstimate / freeExact }
    // Beyond what double precision carries (a total near 1e-300, a constant near 10^±100) there is no estimate to show.
    if (!(freeExact > 0) || ![a, freeEstimate, entry.factor].every(Number.isFinite)) return
    components.push(entry)
  })

  const solids: Shortcut['solids'] = []
  for (const s of model.solids) {
    const held = s.nu.flatMap((v, k) => (k !== jH && v !== 0 ? [k] : []))
    if (held.length !== 2 || held.some((k) => s.nu[k]! < 0)) continue
    const [m, l] = held as [number, number]
    const a = s.nu[m]!
    const b = s.nu[l]!
    const alphaM = alphas.get(model.components[m]!.name)
    const alphaL = alphas.get(model.components[l]!.name)
    if (alphaM === undefined || alphaL === undefined) continue
    // Saturation: Π a_j^ν_j = 10^−logK; with h held, a_M^a a_L^b = 10^−logK h^−νH.
    const ksp = Math.pow(10, -s.logK) * (jH >= 0 ? Math.pow(h, -(s.nu[jH] ?? 0)) : 1)
    const estimate = Math.pow(ksp / (Math.pow(a, a) * Math.pow(b, b) * Math.pow(alphaM, a) * Math.pow(alphaL, b)), 1 / (a + b))
    const exact = Math.min(...[m, l].map((k) => (componentResult.get(model.components[k]!.name)?.dissolved ?? Number.NaN) / s.nu[k]!))
    if (!(exact > 0) || ![estimate, exact, estimate / exact].every(Number.isFinite)) continue
    solids.push({ name: s.name, solubilityEstimate: estimate, solubilityExact: exact, factor: estimate / exact })
  }
  return { pH: result.pH, components, solids }
}

/** A factor this far from 1 (either way) is "far off": the panel then says which assumption broke. */
export const FAR_FACTOR = 2

/**
 * In words, why the shortcut for component `name` is far off: ligand
 * depletion (a ligand's free amount is not its total times its protonation
 * fraction), polynuclear species, activity (γ of the free ion), or a pH the
 * hand method could not have known. Empty when the factor is near 1.
 */
export function shortcutReasons(model: ShortcutModel, result: Result, entry: Shortcut['components'][number]): string[] {
  if (!(Math.abs(Math.log10(entry.factor)) > Math.log10(FAR_FACTOR))) return []
  const reasons: string[] = []
  const j = model.components.findIndex((c) => c.name === entry.name)
  const jH = model.components.findIndex((c) => c.name === 'H+')
  const concentration = new Map(result.species.map((s) => [s.name, s]))
  const dissolved = result.components.find((c) => c.name === entry.name)?.dissolved ?? Number.NaN
  // Ligand depletion: a ligand of X whose exact free amount is far below the hand method's total × p(Y).
  const ligands = new Set<number>()
  for (const s of model.species) if (s.nu[j] === 1) s.nu.forEach((v, k) => { if (k !== j && k !== jH && v > 0) ligands.add(k) })
  for (const k of ligands) {
    const c = model.components[k]!
    if (FIXED_MODES.has(c.mode)) continue
    const r = result.components.find((x) => x.name === c.name)
    // The exact free ligand against what the hand method took for it (total × protonation fraction, free form only).
    const free = r?.freeConcentration ?? r?.free
    if (r && free !== undefined && free < 0.5 * r.total * protonationFraction(model, result.pH, k)) {
      reasons.push(`ligand depletion: ${c.name} is bound up, so its free amount is far below its total times its protonation fraction`)
    }
  }
  // Polynuclear species: species holding two or more X carry a share the hand method leaves out.
  let poly = 0
  for (const s of model.species) if ((s.nu[j] ?? 0) >= 2) poly += (s.nu[j] ?? 0) * (concentration.get(s.name)?.concentration ?? 0)
  if (dissolved > 0 && poly / dissolved > 0.1) reasons.push(`polynuclear species: they hold ${Math.round((100 * poly) / dissolved)} % of the dissolved ${entry.name}, and the hand method leaves them out`)
  // Activity: the hand method takes every γ as 1.
  const gamma = concentration.get(entry.name)?.gamma ?? 1
  if (gamma < 0.7) reasons.push(`activity: γ of ${entry.name} is ${gamma.toFixed(2)} at this ionic strength, and the hand method takes it as 1`)
  const h = jH >= 0 ? model.components[jH]! : null
  if (h && h.mode !== 'pH') reasons.push('pH not fixed: the pH here is the exact answer\'s; by hand it would have had to be known beforehand')
  if (reasons.length === 0) reasons.push('the species the hand method counts do not describe this answer well: compare the species table')
  return reasons
}

/** p(X) at a pH: 1 / Σ β h^νH over the species of one X and H+ only (the free form counts 1). */
export function protonationFraction(model: ShortcutModel, pH: number, j: number): number {
  const { jH, protonated } = layoutOf(model)
  const h = Math.pow(10, -pH)
  let sum = 0
  for (const i of protonated[j] ?? []) {
    const s = model.species[i]!
    sum += Math.pow(10, s.logK) * (jH >= 0 ? Math.pow(h, s.nu[jH] ?? 0) : 1)
  }
  return sum > 0 ? 1 / sum : Number.NaN
}
