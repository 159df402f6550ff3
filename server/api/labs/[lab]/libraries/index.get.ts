/** GET /api/labs/:lab/libraries — the lab's library systems (the names `use` takes) with their latest revision. */
import { and, asc, eq, max } from 'drizzle-orm'
import { LabParams } from '#shared/utils/lab-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const rows = await useDb()
    .select({ name: tables.systems.slug, title: tables.systems.title, latestRevision: max(tables.revisions.number) })
    .from(tables.systems)
    .innerJoin(tables.revisions, eq(tables.revisions.systemId, tables.systems.id))
    .where(and(eq(tables.systems.labId, lab.id), eq(tables.systems.isLibrary, true)))
    .groupBy(tables.systems.id)
    .orderBy(asc(tables.systems.slug))
  return { libraries: rows.map((r) => ({ ...r, latestRevision: Number(r.latestRevision) })) }
})
