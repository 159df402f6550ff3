/** GET /api/labs/:lab/libraries/:name/revisions/:n — the text of one library revision (for the editor's hover and completion). */
import { and, eq } from 'drizzle-orm'
import { LibraryRevisionParams } from '#shared/utils/library-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, LibraryRevisionParams)
  const { lab } = await requireLabRole(event, params.lab, 'viewer')
  const [row] = await useDb().select({ source: tables.revisions.source, sha256: tables.revisions.sha256 })
    .from(tables.revisions)
    .innerJoin(tables.systems, eq(tables.systems.id, tables.revisions.systemId))
    .where(and(eq(tables.systems.labId, lab.id), eq(tables.systems.slug, params.name), eq(tables.systems.isLibrary, true), eq(tables.revisions.number, params.n)))
  if (!row) throw createError({ statusCode: 404, message: `${lab.name} has no library "${params.name}" with a revision ${params.n}` })
  return { name: params.name, revision: params.n, sha256: row.sha256, source: row.source }
})
