import { desc, eq, max } from 'drizzle-orm'
import type { RecentSystemsAnswer } from '#shared/types/account'

/** How many systems the home page lists: enough to pick up where you left off, short enough to scan. */
const RECENT_LIMIT = 8

/**
 * GET /api/me/recent-systems — the most recently saved systems of the labs I
 * am a member of, newest save first, with the lab and the latest revision.
 */
export default defineEventHandler(async (event): Promise<RecentSystemsAnswer> => {
  const user = await requireUser(event)
  const savedAt = max(tables.revisions.createdAt)
  const rows = await useDb()
    .select({
      slug: tables.systems.slug,
      title: tables.systems.title,
      lab: { slug: tables.labs.slug, name: tables.labs.name },
      latestRevision: max(tables.revisions.number),
      savedAt,
    })
    .from(tables.labMembers)
    .innerJoin(tables.labs, eq(tables.labs.id, tables.labMembers.labId))
    .innerJoin(tables.systems, eq(tables.systems.labId, tables.labs.id))
    .innerJoin(tables.revisions, eq(tables.revisions.systemId, tables.systems.id))
    .where(eq(tables.labMembers.userId, user.id))
    .groupBy(tables.systems.id, tables.labs.id)
    .orderBy(desc(savedAt), desc(tables.systems.id))
    .limit(RECENT_LIMIT)
  return {
    systems: rows.map((s) => ({ ...s, savedAt: s.savedAt ? new Date(s.savedAt).toISOString() : null })),
  }
})
