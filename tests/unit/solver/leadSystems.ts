/**
 * Lead in drinking water with carbonate: the competing solids of one metal
 * (hydroxide, carbonate, a basic carbonate with three lead atoms, a
 * phosphate and a basic phosphate) used by the solver's phase tests.
 *
 * Constants from memory (values of the usual compilations for 25 °C, I = 0;
 * common practice for a model of lead solubility): carbonic acid pKa 6.35,
 * 10.33; phosphoric acid pKa 2.15, 7.20, 12.35; PbOH+ log*β −7.71,
 * Pb(OH)2 −17.12, Pb(OH)3− −28.06; PbCO3(aq) log K 7.24, Pb(CO3)2^2− 10.64,
 * PbHCO3+ 13.2; PbCO3(s) log Ksp −13.13; Pb3(CO3)2(OH)2(s) log K −18.77 for
 * Pb3(CO3)2(OH)2 + 2H+ = 3Pb2+ + 2CO3^2− + 2H2O; Pb(OH)2(s) log *Ksp 8.15;
 * PbHPO4(s) log Ksp −23.8; Pb5(PO4)3OH(s) log Ksp −76.8.
 */
import type { Model } from '../../../shared/poise/model'
import { buildModel, hydroxide, type ComponentSpec, type FormationSpec, type ModelSpec } from './modelBuilder'

export interface LeadOptions {
  pH?: number
  lead?: number
  carbonate?: number
  phosphate?: number
  activity?: Model['activity']
  sweep?: ModelSpec['sweep']
  /** Which solids to offer (all by default). */
  solids?: string[]
}

export function leadModel(o: LeadOptions = {}): Model {
  const components: ComponentSpec[] = [
    { name: 'H+', charge: 1, mode: 'pH', value: o.pH ?? 7 },
    { name: 'Pb^2+', charge: 2, mode: 'total', value: o.lead ?? 1e-4 },
    { name: 'CO3^2-', charge: -2, mode: 'total', value: o.carbonate ?? 1e-3 },
    { name: 'Na+', charge: 1, mode: 'total', value: 2e-3 },
    { name: 'Cl-', charge: -1, mode: 'total', value: 2e-3 },
  ]
  const species: FormationSpec[] = [
    hydroxide(),
    { name: 'HCO3-', charge: -1, nu: { 'CO3^2-': 1, 'H+': 1 }, logK: 10.33 },
    { name: 'H2CO3', nu: { 'CO3^2-': 1, 'H+': 2 }, logK: 16.68 },
    { name: 'PbOH+', charge: 1, nu: { 'Pb^2+': 1, 'H+': -1 }, logK: -7.71 },
    { name: 'Pb(OH)2', nu: { 'Pb^2+': 1, 'H+': -2 }, logK: -17.12 },
    { name: 'Pb(OH)3-', charge: -1, nu: { 'Pb^2+': 1, 'H+': -3 }, logK: -28.06 },
    { name: 'PbCO3', nu: { 'Pb^2+': 1, 'CO3^2-': 1 }, logK: 7.24 },
    { name: 'Pb(CO3)2^2-', charge: -2, nu: { 'Pb^2+': 1, 'CO3^2-': 2 }, logK: 10.64 },
    { name: 'PbHCO3+', charge: 1, nu: { 'Pb^2+': 1, 'CO3^2-': 1, 'H+': 1 }, logK: 13.2 },
  ]
  const solids: FormationSpec[] = [
    { name: 'PbCO3(s)', nu: { 'Pb^2+': 1, 'CO3^2-': 1 }, logK: 13.13 },
    { name: 'Pb3(CO3)2(OH)2(s)', nu: { 'Pb^2+': 3, 'CO3^2-': 2, 'H+': -2 }, logK: 18.77 },
    { name: 'Pb(OH)2(s)', nu: { 'Pb^2+': 1, 'H+': -2 }, logK: -8.15 },
  ]
  if (o.phosphate !== undefined) {
    components.push({ name: 'PO4^3-', charge: -3, mode: 'total', value: o.phosphate })
    species.push(
      { name: 'HPO4^2-', charge: -2, nu: { 'PO4^3-': 1, 'H+': 1 }, logK: 12.35 },
      { name: 'H2PO4-', charge: -1, nu: { 'PO4^3-': 1, 'H+': 2 }, logK: 19.55 },
      { name: 'H3PO4', nu: { 'PO4^3-': 1, 'H+': 3 }, logK: 21.7 },
    )
    solids.push(
      { name: 'PbHPO4(s)', nu: { 'Pb^2+': 1, 'PO4^3-': 1, 'H+': 1 }, logK: 23.8 },
      // Pb5(PO4)3OH: 5 Pb2+ + 3 PO4^3- + H2O − H+.
      { name: 'Pb5(PO4)3OH(s)', nu: { 'Pb^2+': 5, 'PO4^3-': 3, 'H+': -1 }, logK: 76.8 - 14 },
    )
  }
  const offered = o.solids ? solids.filter((s) => o.solids!.includes(s.name)) : solids
  return buildModel({ activity: o.activity ?? 'davies', components, species, solids: offered, sweep: o.sweep })
}
