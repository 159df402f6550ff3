/**
 * The fit's cost (server/solver/fit.ts): two pKa of a diprotic acid fitted
 * to 45 titration points made from known constants, from starting values
 * 0.4 log units off. Reports the wall time and how many exact solves of the
 * whole study it took (one per evaluation: each step and each column of
 * the Jacobian).
 */
import { compile } from '../shared/poise/index'
import { titration } from '../server/solver/index'
import { fitConstants } from '../server/solver/fit'
import { parseDataSet } from '../shared/fit/dataset'
import type { TitrationCurveResult } from '../shared/types/result'

const text = (pKa1: string, pKa2: string) => `system "Bench: a diprotic acid titrated with caustic"
activity ideal
component H+         balance
component C4H4O4^2-  total 10 mmol/L
component Na+        total 0 mol/L
reaction H2O <=> H+ + OH-             pKw 14.00  cite "from memory"
reaction C4H5O4- <=> C4H4O4^2- + H+   pKa ${pKa2} fit  cite "invented for the bench"
reaction C4H6O4 <=> C4H5O4- + H+      pKa ${pKa1} fit  cite "invented for the bench"
sample volume 50 mL
titrant Na+ 0.1 mol/L
titrant OH- 0.1 mol/L
titrate from 0 to 12 mL step 0.5
`

export function fitFigures(reps = 3): { fitMs: number; iterations: number; points: number } {
  const truth = compile(text('3.90', '6.20')).model!
  const volumes = Array.from({ length: 45 }, (_, i) => 0.2 * (i + 1))
  const curve = titration({ ...truth, titration: { ...truth.titration!, values: volumes, targetPH: null } }) as TitrationCurveResult
  const csv = 'volume mL,pH\n' + volumes.map((v, i) => `${v.toFixed(2)},${(curve.points[i]!.pH + (i % 2 ? 0.01 : -0.01)).toFixed(5)}`).join('\n')
  const parsed = parseDataSet(csv)
  if (!parsed.ok) throw new Error('bench data set did not parse')
  const start = text('4.30', '5.80')
  const times: number[] = []
  let iterations = 0
  for (let k = 0; k < reps; k++) {
    const t0 = performance.now()
    const out = fitConstants(start, parsed.data)
    times.push(performance.now() - t0)
    if (!out.ok || !out.fit.converged) throw new Error(`bench fit failed: ${out.ok ? out.fit.reason : out.message}`)
    iterations = out.fit.iterations
  }
  times.sort((a, b) => a - b)
  return { fitMs: times[Math.floor(times.length / 2)]!, iterations, points: volumes.length }
}
