/**
 * Ion-size parameters å (ångström) for the extended Debye–Hückel equation.
 *
 * Source: J. Kielland (1937), "Individual activity coefficients of ions in
 * aqueous solutions", J. Am. Chem. Soc. 59, 1675–1678. The values below are
 * recalled from memory of that table, not looked up: check them before
 * relying on a third decimal of γ. Ions not listed take a default by charge
 * (common practice: larger, more hydrated ions for higher charge).
 */

const KIELLAND_ANGSTROM: Record<string, number> = {
  'H+': 9, 'Al^3+': 9, 'Fe^3+': 9, 'Cr^3+': 9, 'La^3+': 9,
  'Mg^2+': 8, 'Be^2+': 8,
  'Li+': 6, 'Ca^2+': 6, 'Cu^2+': 6, 'Zn^2+': 6, 'Mn^2+': 6, 'Fe^2+': 6, 'Ni^2+': 6, 'Co^2+': 6, 'Sn^2+': 6,
  'Sr^2+': 5, 'Ba^2+': 5, 'Cd^2+': 5, 'Hg^2+': 5, 'S^2-': 5,
  'Pb^2+': 4.5, 'CO3^2-': 4.5, 'SO3^2-': 4.5, 'CH3COO-': 4.5,
  'Na+': 4, 'HCO3-': 4, 'H2PO4-': 4, 'HSO3-': 4, 'IO3-': 4,
  'SO4^2-': 4, 'HPO4^2-': 4, 'PO4^3-': 4, 'CrO4^2-': 4, 'Hg2^2+': 4,
  'OH-': 3.5, 'F-': 3.5, 'HS-': 3.5, 'SCN-': 3.5, 'ClO3-': 3.5, 'ClO4-': 3.5, 'MnO4-': 3.5,
  'K+': 3, 'Cl-': 3, 'Br-': 3, 'I-': 3, 'CN-': 3, 'NO2-': 3, 'NO3-': 3,
  'Rb+': 2.5, 'Cs+': 2.5, 'NH4+': 2.5, 'Ag+': 2.5, 'Tl+': 2.5,
}

/** Default å by |charge| for ions outside the table (common practice). */
function defaultIonSize(charge: number): number {
  const z = Math.abs(charge)
  if (z <= 1) return 4
  if (z === 2) return 5
  return 6
}

/** Ion-size parameter of a species, Å: the table's value or the default by charge. */
export function ionSizeAngstrom(name: string, charge: number): number {
  return KIELLAND_ANGSTROM[name] ?? defaultIonSize(charge)
}
