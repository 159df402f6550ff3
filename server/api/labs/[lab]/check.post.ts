/**
 * POST /api/labs/:lab/check — like /api/check, with the lab's libraries: a
 * `use "name"` or `use "name" @ N` resolves to that library of this lab, and
 * a missing one is reported under its line.
 */
import { LabParams } from '#shared/utils/lab-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const source = await readSourceBody(event)
  const { model, diagnostics } = compileCached(source, { resolveLibrary: await libraryResolverFor(lab.id, source) })
  return {
    ok: !diagnostics.some((d) => d.severity === 'error'),
    diagnostics,
    libraries: model?.libraries ?? [],
    summary: model
      ? { title: model.title, components: model.components.length, species: model.species.length, solids: model.solids.length, sweepPoints: model.sweep?.values.length ?? 0 }
      : null,
  }
})
