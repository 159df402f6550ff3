/**
 * POST /api/solve — stateless: a Poise text in, the Result (or sweep) out.
 * Nothing is stored; runs of saved revisions go through the systems routes.
 */
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const source = await readSourceBody(event)
  const { model, diagnostics } = compileForSolve(source)
  const output = await solveInPool(model)
  return sendJsonWithRaw(event, {
    kind: output.kind,
    solverVersion: output.solverVersion,
    elapsedMs: Math.round(output.elapsedMs * 10) / 10,
    diagnostics,
  }, 'result', output.resultBytes)
})
