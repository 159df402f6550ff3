/**
 * POST /api/solve — stateless: a Poise text in, the Result (or sweep) out.
 * Nothing is stored; runs of saved revisions go through the systems routes.
 */
import { COMPILER_VERSION } from '#shared/poise/version'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const source = await readSourceBody(event)
  const { model, diagnostics } = compileForSolve(source)
  const output = await solveInPool(model, user.id, model.sweep && !model.titration && acceptsBinaryAnswer(event) ? 'columns' : 'points')
  const head = {
    kind: output.kind,
    solverVersion: output.solverVersion,
    compilerVersion: COMPILER_VERSION,
    elapsedMs: Math.round(output.elapsedMs * 10) / 10,
    diagnostics,
  }
  const raw = { result: output.resultBytes, model: JSON.stringify(model) }
  if (output.form === 'columns') return sendBinaryAnswer(event, head, raw, output.resultArrays ?? [])
  return sendJsonBytesWithRaws(event, head, raw)
})
