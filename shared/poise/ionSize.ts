/**
 * Ion-size parameters å (ångström) for the extended Debye–Hückel equation:
 * the built-in default of `activity debye-huckel`. A file overrides any of
 * them, or gives one for an ion not listed, with `ion-size SPECIES N Å`; the
 * compiler writes the size it took into the model (`ModelSpecies.ionSize`).
 *
 * Source: J. Kielland (1937), "Individual activity coefficients of ions in
 * aqueous solutions", J. Am. Chem. Soc. 59, 1675–1678. The values below are
 * recalled from memory of that table, not looked up: check them before
 * relying on a third decimal of γ. Ions not listed take a guess by charge
 * (common practice: larger, more hydrated ions for higher charge), and the
 * compiler warns about each one (W107).
 */

export const ION_SIZE_TABLE: Readonly<Record<string, number>> = {
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

/** Guess of å by |charge| for ions outside the table (common practice). */
export function ionSizeByCharge(charge: number): number {
  const z = Math.abs(charge)
  if (z <= 1) return 4
  if (z === 2) return 5
  return 6
}

export type IonSizeSource = 'file' | 'table' | 'charge'

/** The default ion size of a species, Å, and where it comes from: the table, or the guess by charge. */
export function defaultIonSize(name: string, charge: number): { angstrom: number; source: Exclude<IonSizeSource, 'file'> } {
  const listed = ION_SIZE_TABLE[name]
  return listed !== undefined ? { angstrom: listed, source: 'table' } : { angstrom: ionSizeByCharge(charge), source: 'charge' }
}

/** Ion-size parameter of a species, Å: the table's value or the guess by charge. */
export function ionSizeAngstrom(name: string, charge: number): number {
  return defaultIonSize(name, charge).angstrom
}

/** The table as Markdown rows grouped by size, for grammar/README.md. */
export function ionSizeTable(): string {
  const bySize = new Map<number, string[]>()
  for (const [name, a] of Object.entries(ION_SIZE_TABLE)) bySize.set(a, [...(bySize.get(a) ?? []), name])
  const rows = [...bySize].sort(([a], [b]) => b - a).map(([a, names]) => `| ${a} Å | ${names.map((n) => `\`${n}\``).join(' ')} |`)
  return ['| å | ions |', '| --- | --- |', ...rows].join('\n')
}
