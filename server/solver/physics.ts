/**
 * Temperature dependence of the activity model: the Debye–Hückel
 * parameters A(T) and B(T) computed from the physics of a dielectric
 * continuum with the water properties below (so they stay right away from
 * 25 °C instead of being frozen at a tabulated value). van 't Hoff for the
 * constants, with the one gas constant, is `vantHoff` in shared/poise/thermo.ts.
 */
import { KELVIN_OFFSET } from '../../shared/poise/thermo'

const ELEMENTARY_CHARGE = 1.602176634e-19 // C, exact (SI 2019)
const VACUUM_PERMITTIVITY = 8.8541878128e-12 // F/m (CODATA 2018)
const BOLTZMANN = 1.380649e-23 // J/K, exact (SI 2019)
const AVOGADRO = 6.02214076e23 // 1/mol, exact (SI 2019)

/**
 * Relative permittivity of liquid water at 1 atm, 0–100 °C: the cubic of
 * Malmberg & Maryott (1956), J. Res. Natl. Bur. Stand. 56, 1 (coefficients
 * from memory; gives 78.30 at 25 °C).
 */
export function waterPermittivity(tC: number): number {
  return 87.740 - 0.40008 * tC + 9.398e-4 * tC * tC - 1.41e-6 * tC * tC * tC
}

/**
 * Density of air-free water at 1 atm, kg/m³, 0–150 °C: the rational
 * polynomial of Kell (1975), J. Chem. Eng. Data 20(1), 97–105, for the 1968
 * temperature scale — numerator coefficients 999.83952, 16.945176,
 * −7.9870401e-3, −46.170461e-6, 105.56302e-9, −280.54253e-12 and
 * denominator 1 + 16.879850e-3 t (997.047 kg/m³ at 25 °C, 999.972 at 4 °C).
 */
export function waterDensity(tC: number): number {
  const t = tC
  const num = 999.83952 + 16.945176 * t - 7.9870401e-3 * t ** 2 - 46.170461e-6 * t ** 3
    + 105.56302e-9 * t ** 4 - 280.54253e-12 * t ** 5
  return num / (1 + 16.879850e-3 * t)
}

/** Inverse Debye length per √(mol/kg) of ionic strength, in 1/m. */
function debyeKappaPerRootI(tC: number): number {
  const T = tC + KELVIN_OFFSET
  const eps = waterPermittivity(tC)
  const rho = waterDensity(tC)
  const e2 = ELEMENTARY_CHARGE * ELEMENTARY_CHARGE
  return Math.sqrt((2 * AVOGADRO * e2 * rho) / (VACUUM_PERMITTIVITY * eps * BOLTZMANN * T))
}

/**
 * Debye–Hückel A in log10 γ = −A z² √I, kg^½ mol^−½ (molal ionic strength,
 * which equals mol/L within 0.3 % below 100 °C for dilute solutions):
 * A = e² κ / (8π ε0 εr k T ln 10) per √I. About 0.511 at 25 °C with the
 * permittivity above.
 */
export function debyeHuckelA(tC: number): number {
  const T = tC + KELVIN_OFFSET
  const eps = waterPermittivity(tC)
  const e2 = ELEMENTARY_CHARGE * ELEMENTARY_CHARGE
  return (e2 * debyeKappaPerRootI(tC)) / (8 * Math.PI * VACUUM_PERMITTIVITY * eps * BOLTZMANN * T * Math.LN10)
}

/** Debye–Hückel B in 1 + B å √I, per ångström per √(mol/kg): κ/√I in Å⁻¹ (about 0.329 at 25 °C). */
export function debyeHuckelB(tC: number): number {
  return debyeKappaPerRootI(tC) * 1e-10
}
