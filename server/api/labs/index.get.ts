import { asc, eq } from 'drizzle-orm'
import type { LabListAnswer } from '#shared/types/system'

/** The labs I am a member of, with my role. */
export default defineEventHandler(async (event): Promise<LabListAnswer> => {
  const user = await requireUser(event)
  const labs = await useDb()
    .select({ slug: tables.labs.slug, name: tables.labs.name, role: tables.labMembers.role })
    .from(tables.labMembers)
    .innerJoin(tables.labs, eq(tables.labs.id, tables.labMembers.labId))
    .where(eq(tables.labMembers.userId, user.id))
    .orderBy(asc(tables.labs.name))
  return { labs }
})
