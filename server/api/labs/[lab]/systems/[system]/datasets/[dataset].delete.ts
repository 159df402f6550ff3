/** DELETE /api/labs/:lab/systems/:system/datasets/:dataset — an editor deletes a data set (audit-logged). Revisions that cite it keep their citation. */
import { eq } from 'drizzle-orm'
import { DatasetParams } from '#shared/utils/dataset-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, DatasetParams)
  const { system, user, lab } = await requireSystem(event, params.lab, params.system, 'editor')
  const row = await requireDataset(system.id, params.dataset)
  await useDb().transaction(async (tx) => {
    await tx.delete(tables.datasets).where(eq(tables.datasets.id, row.id))
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'dataset.delete', detail: { slug: system.slug, dataset: row.id, name: row.name, sha256: row.sha256 } })
  })
  return { deleted: row.id }
})
