/**
 * POST /api/labs/:lab/solve — like /api/solve (nothing stored), with the lab's
 * libraries, so an unsaved draft that `use`s one can be tried, and a viewer's
 * Run is a preview of the saved text. The answer carries the model it solved
 * (with the library revisions it used) and the compiler and solver versions.
 */
import { COMPILER_VERSION } from '#shared/poise/version'
import { LabParams } from '#shared/utils/lab-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'viewer')
  const source = await readSourceBody(event)
  const { model, diagnostics } = compileForSolve(source, { resolveLibrary: await libraryResolverFor(lab.id, source) })
  const output = await solveInPool(model, user.id, model.sweep && !model.titration && acceptsBinaryAnswer(event) ? 'columns' : 'points')
  const head = {
    kind: output.kind,
    solverVersion: output.solverVersion,
    compilerVersion: COMPILER_VERSION,
    elapsedMs: Math.round(output.elapsedMs * 10) / 10,
    diagnostics,
    libraries: model.libraries,
  }
  const raw = { result: output.resultBytes, model: JSON.stringify(model) }
  if (output.form === 'columns') return sendBinaryAnswer(event, head, raw, output.resultArrays ?? [])
  return sendJsonBytesWithRaws(event, head, raw)
})
