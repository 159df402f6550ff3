/**
 * POST /api/labs/:lab/systems/:system/datasets/:dataset/fit — fits the
 * constants a revision (the latest unless `revision`) marks `fit` to the
 * data set, in the solver pool; stores nothing (viewer). 422 with what to
 * change when the fit cannot run.
 */
import { DatasetParams, FitBody } from '#shared/utils/dataset-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, DatasetParams)
  const access = await requireSystem(event, params.lab, params.system, 'viewer')
  const body = await validateBody(event, FitBody)
  const row = await requireDataset(access.system.id, params.dataset)
  const revision = body.revision === undefined || body.revision === access.latest.number ? access.latest : await findRevision(access.system.id, body.revision)
  const fit = await fitRevision(access.lab.id, access.user.id, revision.source, dataOf(row), body.weights)
  return { revision: revision.number, dataset: datasetSummary(row, null), fit }
})
