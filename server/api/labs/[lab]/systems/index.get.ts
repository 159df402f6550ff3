import { asc, eq, max } from 'drizzle-orm'
import { LabParams } from '#shared/utils/lab-schemas'
import type { SystemListAnswer } from '#shared/types/system'

/** The lab's systems with their latest revision number. */
export default defineEventHandler(async (event): Promise<SystemListAnswer> => {
  const params = validateParams(event, LabParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const systems = await useDb()
    .select({
      slug: tables.systems.slug,
      title: tables.systems.title,
      isLibrary: tables.systems.isLibrary,
      latestRevision: max(tables.revisions.number),
      updatedAt: max(tables.revisions.createdAt),
    })
    .from(tables.systems)
    .leftJoin(tables.revisions, eq(tables.revisions.systemId, tables.systems.id))
    .where(eq(tables.systems.labId, lab.id))
    .groupBy(tables.systems.id)
    .orderBy(asc(tables.systems.title))
  return {
    systems: systems.map((s) => ({ ...s, updatedAt: s.updatedAt ? new Date(s.updatedAt).toISOString() : null })),
  }
})
