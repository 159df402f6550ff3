/**
 * Builds compiled models by hand for the solver tests, in the shape the Poise
 * compiler produces (shared/poise/model.ts): every aqueous component's free
 * form is a species with a unit stoichiometry and logK 0.
 */
import type { ComponentMode, Model, ModelSweep } from '../../../shared/poise/model'

export interface ComponentSpec { name: string; charge: number; mode: ComponentMode; value: number; phase?: 'aq' | 's' | 'g' }
export interface FormationSpec { name: string; charge?: number; nu: Record<string, number>; logK: number; dH?: number; suppressed?: boolean }

export interface ModelSpec {
  components: ComponentSpec[]
  species?: FormationSpec[]
  solids?: FormationSpec[]
  gases?: FormationSpec[]
  activity?: Model['activity']
  temperatureC?: number
  fixedIonicStrength?: number | null
  sweep?: Omit<ModelSweep, 'line' | 'log'> & { log?: boolean }
}

export function buildModel(spec: ModelSpec): Model {
  const names = spec.components.map((c) => c.name)
  const vector = (nu: Record<string, number>) => {
    for (const k of Object.keys(nu)) if (!names.includes(k)) throw new Error(`builder: unknown component ${k}`)
    return names.map((n) => nu[n] ?? 0)
  }
  const formation = (f: FormationSpec) => ({
    nu: vector(f.nu), logK: f.logK, logKRef: f.logK, dH: f.dH ?? null, line: 1, elements: {},
  })
  return {
    title: 'test system',
    temperatureC: spec.temperatureC ?? 25,
    refTemperatureC: 25,
    activity: spec.activity ?? 'ideal',
    fixedIonicStrength: spec.fixedIonicStrength ?? null,
    components: spec.components.map((c, j) => ({
      name: c.name, charge: c.charge, phase: c.phase ?? 'aq', mode: c.mode, value: c.value,
      elements: {}, molarMass: 1, line: j + 1,
    })),
    species: [
      ...spec.components.flatMap((c, j) => (c.phase ?? 'aq') === 'aq'
        ? [{ name: c.name, charge: c.charge, componentIndex: j, ...formation({ name: c.name, nu: { [c.name]: 1 }, logK: 0 }) }]
        : []),
      ...(spec.species ?? []).map((s) => ({ name: s.name, charge: s.charge ?? 0, componentIndex: null, ...formation(s) })),
    ],
    solids: (spec.solids ?? []).map((s) => ({ name: s.name, suppressed: s.suppressed ?? false, ...formation(s) })),
    gases: (spec.gases ?? []).map((g) => ({ name: g.name, ...formation(g) })),
    reactions: [],
    sweep: spec.sweep ? { log: false, line: 1, ...spec.sweep } : null,
    sources: {},
    libraries: [],
  }
}

/** Water: OH- = H2O − H+, log β = −pKw. */
export const hydroxide = (pKw = 14): FormationSpec => ({ name: 'OH-', charge: -1, nu: { 'H+': -1 }, logK: -pKw })

export const species = (result: { species: { name: string; concentration: number }[] }, name: string): number => {
  const s = result.species.find((x) => x.name === name)
  if (!s) throw new Error(`no species ${name} in the result`)
  return s.concentration
}
