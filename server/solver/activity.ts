/**
 * Activity coefficients as functions of u = √I. Working in u keeps the
 * derivative finite at I = 0, which lets ionic strength be one more unknown of
 * the Newton system instead of a slow fixed point around it.
 */

export type ActivityCode = 0 | 1 | 2 // ideal, davies, extended Debye–Hückel

export const ACTIVITY_IDEAL: ActivityCode = 0
export const ACTIVITY_DAVIES: ActivityCode = 1
export const ACTIVITY_DEBYE_HUCKEL: ActivityCode = 2

/** Usual upper limit of ionic strength for each model, mol/L (common practice). */
export const ACTIVITY_RANGE_LIMIT: Record<'davies' | 'debye-huckel', number> = {
  davies: 0.5,
  'debye-huckel': 0.1,
}

/**
 * Davies (1938): log10 γ = −A z² (√I/(1+√I) − 0.3 I).
 * Extended Debye–Hückel: log10 γ = −A z² √I / (1 + B å √I).
 */
export function logGamma(code: ActivityCode, A: number, Ba: number, z2: number, u: number): number {
  if (code === ACTIVITY_IDEAL || z2 === 0) return 0
  if (code === ACTIVITY_DAVIES) return -A * z2 * (u / (1 + u) - 0.3 * u * u)
  return (-A * z2 * u) / (1 + Ba * u)
}

/** d(log10 γ)/du of `logGamma`, u = √I. */
export function dLogGammaDu(code: ActivityCode, A: number, Ba: number, z2: number, u: number): number {
  if (code === ACTIVITY_IDEAL || z2 === 0) return 0
  if (code === ACTIVITY_DAVIES) return -A * z2 * (1 / ((1 + u) * (1 + u)) - 0.6 * u)
  const d = 1 + Ba * u
  return (-A * z2) / (d * d)
}
