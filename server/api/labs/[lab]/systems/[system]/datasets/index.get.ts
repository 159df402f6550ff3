/** GET /api/labs/:lab/systems/:system/datasets — the system's data sets, newest first (viewer). */
import { desc, eq } from 'drizzle-orm'
import { SystemParams } from '#shared/utils/lab-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, SystemParams)
  const { system } = await requireSystem(event, params.lab, params.system, 'viewer')
  const rows = await useDb().select({ dataset: tables.datasets, author: tables.users.name })
    .from(tables.datasets).leftJoin(tables.users, eq(tables.users.id, tables.datasets.createdBy))
    .where(eq(tables.datasets.systemId, system.id)).orderBy(desc(tables.datasets.id))
  return { datasets: rows.map((r) => datasetSummary(r.dataset, r.author)) }
})
