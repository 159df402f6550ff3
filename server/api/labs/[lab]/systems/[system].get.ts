import { eq } from 'drizzle-orm'
import { SystemParams } from '#shared/utils/lab-schemas'
import type { SystemAnswer } from '#shared/types/system'

/** A system with its latest revision. */
export default defineEventHandler(async (event): Promise<SystemAnswer> => {
  const params = validateParams(event, SystemParams)
  const { system, latest, role, lab } = await requireSystem(event, params.lab, params.system, 'viewer')
  const [author] = latest.authorId
    ? await useDb().select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.id, latest.authorId))
    : []
  return {
    lab: { slug: lab.slug, name: lab.name },
    role,
    system: { slug: system.slug, title: system.title, isLibrary: system.isLibrary, latest: revisionView(latest, author?.name ?? null) },
  }
})
