/** Temperature dependence of equilibrium constants. */

/** Molar gas constant, J/(mol·K): exact in the 2019 SI (N_A × k_B). */
export const GAS_CONSTANT = 8.31446261815324
export const REFERENCE_TEMPERATURE_C = 25
/** 0 °C in kelvin. */
export const KELVIN_OFFSET = 273.15

/**
 * van 't Hoff with a constant reaction enthalpy:
 * log10 K(T) = log10 K(T0) − ΔH/(R ln 10) · (1/T − 1/T0), T0 = 298.15 K.
 * dH in kJ/mol; null is taken as 0 (the constant stays as tabulated).
 */
export function vantHoff(logKRef: number, dHkJ: number | null, temperatureC: number, refC = REFERENCE_TEMPERATURE_C): number {
  if (dHkJ === null || dHkJ === 0 || temperatureC === refC) return logKRef
  const t = temperatureC + KELVIN_OFFSET
  const t0 = refC + KELVIN_OFFSET
  return logKRef - ((dHkJ * 1000) / (GAS_CONSTANT * Math.LN10)) * (1 / t - 1 / t0)
}
