/** GET /api/labs/:lab/systems/:system/datasets/:dataset — one data set with its rows (viewer). */
import { eq } from 'drizzle-orm'
import { DatasetParams } from '#shared/utils/dataset-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, DatasetParams)
  const { system } = await requireSystem(event, params.lab, params.system, 'viewer')
  const row = await requireDataset(system.id, params.dataset)
  const [author] = row.createdBy ? await useDb().select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.id, row.createdBy)) : []
  return { dataset: { ...datasetSummary(row, author?.name ?? null), rows: JSON.parse(row.rows) as (number | null)[][] } }
})
