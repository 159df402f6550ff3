/**
 * Systems of n components for the scaling figure: H+ under the charge
 * balance, Na+, and n − 2 carboxylate-like ligands CkH(2k−1)O2⁻, each with
 * its acid and a sodium ion pair. Demo constants (invented), not data.
 */
export function scalingSystemSource(components: number, points: number): string {
  const ligands = components - 2
  const lines = [
    `system "Benchmark: ${components} components"`,
    'activity davies',
    'component H+ balance',
    `component Na+ total ${(ligands * 0.1 + 1).toFixed(2)} mmol/L`,
    'reaction H2O <=> H+ + OH- pKw 14.00',
  ]
  for (let k = 1; k <= ligands; k++) {
    const l = `C${k}H${2 * k - 1}O2`
    lines.splice(4, 0, `component ${l}^- total 0.1 mmol/L`)
    lines.push(`reaction H${l} <=> ${l}^- + H+ pKa ${(3 + (k % 40) * 0.1).toFixed(2)}`)
    lines.push(`reaction Na+ + ${l}^- <=> Na${l} logbeta ${(0.2 + (k % 7) * 0.05).toFixed(2)}`)
  }
  lines.push(`sweep pH from 3 to 10 points ${points}`)
  return lines.join('\n') + '\n'
}

/** Least-squares slope of log(time) against log(components). */
export function scalingExponent(rows: { components: number, pointUs: number }[]): number {
  const xs = rows.map(r => Math.log(r.components))
  const ys = rows.map(r => Math.log(r.pointUs))
  const mx = xs.reduce((a, b) => a + b, 0) / xs.length
  const my = ys.reduce((a, b) => a + b, 0) / ys.length
  let sxy = 0, sxx = 0
  for (let i = 0; i < xs.length; i++) { sxy += (xs[i] - mx) * (ys[i] - my); sxx += (xs[i] - mx) ** 2 }
  return sxy / sxx
}
