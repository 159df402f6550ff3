/** Small Poise systems for the diff tests (demo values, not handbook data). */
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'

/** Copper and one ammine complex at a fixed free ammonia, so the closed form of a 1:1 complex applies. */
export function copperAmmine(logBeta: number, extra = ''): string {
  return `system "Copper with ammonia at fixed free ligand"
temperature 25 C
activity ideal
component Cu^2+  total 1.0 mmol/L
component NH3    free 1.0 mmol/L
reaction Cu^2+ + NH3 <=> CuNH3^2+   logbeta ${logBeta.toFixed(2)}   cite "demo value"
${extra}`
}

export function compiled(source: string): Model {
  const { model, diagnostics } = compile(source)
  const errors = diagnostics.filter(d => d.severity === 'error')
  if (!model || errors.length) throw new Error(`fixture does not compile: ${errors.map(e => e.message).join('; ')}`)
  return model
}
