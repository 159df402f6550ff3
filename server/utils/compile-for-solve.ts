/**
 * Compile a Poise source for the solver, applying the request limits. Compile
 * errors and limits both answer 422 with the diagnostics, so the caller can
 * show them under the lines they belong to.
 */
import type { CompileOptions } from '../../shared/poise/index'
import type { Model } from '../../shared/poise/model'
import type { Diagnostic } from '../../shared/poise/diagnostics'
import { modelLimitProblem } from './solve-limits'
import { compileCached } from './compile-cache'

export interface CompiledForSolve {
  model: Model
  diagnostics: Diagnostic[]
}

export function compileForSolve(source: string, options: CompileOptions = {}): CompiledForSolve {
  const { model, diagnostics } = compileCached(source, options)
  const errors = diagnostics.filter(d => d.severity === 'error')
  if (!model || errors.length) {
    const first = errors[0]
    const where = first ? ` (line ${first.range.line}: ${first.message})` : ''
    throw createError({
      statusCode: 422,
      message: `The system has ${errors.length || 1} error${errors.length === 1 ? '' : 's'}; fix ${errors.length === 1 ? 'it' : 'them'} before solving${where}`,
      data: { diagnostics },
    })
  }
  const tooBig = modelLimitProblem(model)
  if (tooBig) throw createError({ statusCode: 422, message: tooBig, data: { diagnostics } })
  return { model, diagnostics }
}
