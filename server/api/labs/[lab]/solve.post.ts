/**
 * POST /api/labs/:lab/solve — like /api/solve (nothing stored), with the lab's
 * libraries, so an unsaved draft that `use`s one can be tried. The answer
 * names the library revisions it was solved with.
 */
import { LabParams } from '#shared/utils/lab-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const source = await readSourceBody(event)
  const { model, diagnostics } = compileForSolve(source, { resolveLibrary: await libraryResolverFor(lab.id, source) })
  const output = await solveInPool(model)
  return sendJsonWithRaw(event, {
    kind: output.kind,
    solverVersion: output.solverVersion,
    elapsedMs: Math.round(output.elapsedMs * 10) / 10,
    diagnostics,
    libraries: model.libraries,
  }, 'result', output.resultBytes)
})
