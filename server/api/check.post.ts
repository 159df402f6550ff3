/** POST /api/check — diagnostics and a size summary for a Poise text (no solve). */

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const source = await readSourceBody(event)
  const { model, diagnostics } = compileCached(source)
  return {
    ok: !diagnostics.some(d => d.severity === 'error'),
    diagnostics,
    summary: model
      ? {
          title: model.title,
          components: model.components.length,
          species: model.species.length,
          solids: model.solids.length,
          sweepPoints: model.sweep?.values.length ?? 0,
        }
      : null,
  }
})
