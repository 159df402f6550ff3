/**
 * GET /api/labs/:lab/libraries/:name — one library: its revisions and the
 * systems of the lab that use it, with the revision each asks for and the one
 * its newest run used.
 */
import { and, desc, eq } from 'drizzle-orm'
import { LibraryParams } from '#shared/utils/library-schemas'
import type { LibraryAnswer } from '#shared/types/lab'

export default defineEventHandler(async (event): Promise<LibraryAnswer> => {
  const params = validateParams(event, LibraryParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const db = useDb()
  const [library] = await db.select().from(tables.systems)
    .where(and(eq(tables.systems.labId, lab.id), eq(tables.systems.slug, params.name), eq(tables.systems.isLibrary, true)))
  if (!library) throw createError({ statusCode: 404, message: `${lab.name} has no library "${params.name}"` })
  const revisions = await db.select({ number: tables.revisions.number, message: tables.revisions.message, createdAt: tables.revisions.createdAt, author: tables.users.name })
    .from(tables.revisions)
    .leftJoin(tables.users, eq(tables.users.id, tables.revisions.authorId))
    .where(eq(tables.revisions.systemId, library.id))
    .orderBy(desc(tables.revisions.number))
  return {
    library: { name: library.slug, title: library.title, latestRevision: revisions[0]?.number ?? 0 },
    revisions: revisions.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() })),
    usedBy: await systemsUsingLibrary(lab.id, library.slug),
  }
})
