/**
 * POST /api/labs/:lab/systems/:system/datasets/:dataset/apply — "use these
 * values": fits the latest revision again (it must be `baseRevision`, else
 * 409) and saves revision N+1 in which each fitted constant carries its
 * fitted value, its standard error as ± and a citation of the data set
 * (name and SHA-256). Editor; audit-logged. 422 when the fit did not
 * converge or determines no constant.
 */
import { DatasetParams, ApplyFitBody } from '#shared/utils/dataset-schemas'
import { withFittedValues } from '#shared/fit/constants'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, DatasetParams)
  const { system, latest, user, lab } = await requireSystem(event, params.lab, params.system, 'editor')
  const body = await validateBody(event, ApplyFitBody)
  if (body.baseRevision !== latest.number) throw staleRevisionError(latest, await authorNameOf(latest), body.baseRevision, null)
  const row = await requireDataset(system.id, params.dataset)
  const fit = await fitRevision(lab.id, user.id, latest.source, dataOf(row), body.weights)
  if (!fit.converged) throw createError({ statusCode: 422, message: `The fit did not converge, so nothing was saved: ${fit.reason ?? ''}`.trim() })
  const determined = fit.constants.filter((c) => c.standardError !== null)
  if (!determined.length) throw createError({ statusCode: 422, message: 'The data determine none of the fitted constants, so nothing was saved. Add measurements that depend on them.' })
  const source = withFittedValues(latest.source, fit.constants, row)
  if (source === null) throw createError({ statusCode: 422, message: 'A fitted constant could not be found in the text again; nothing was saved.' })
  const message = `Fitted ${determined.map((c) => `${c.kind} of ${c.reaction}`).join(', ')} to data set ${row.name}`.slice(0, 500)
  const revision = await writeNextRevision(
    { systemId: system.id, latest, source, authorId: user.id, message },
    (tx, next) => recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'dataset.apply', detail: { slug: system.slug, number: next.number, dataset: row.id, sha256: row.sha256 } }),
  )
  setResponseStatus(event, 201)
  return { revision: revisionView(revision, user.name), fit }
})
