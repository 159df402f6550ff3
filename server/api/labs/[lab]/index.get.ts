import { count, eq } from 'drizzle-orm'
import { LabParams } from '#shared/utils/lab-schemas'

/** A lab as its member sees it: name, my role, how many members and systems. */
export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab, role } = await requireLabRole(event, params.lab, 'viewer')
  const db = useDb()
  const [members] = await db.select({ n: count() }).from(tables.labMembers).where(eq(tables.labMembers.labId, lab.id))
  const [systems] = await db.select({ n: count() }).from(tables.systems).where(eq(tables.systems.labId, lab.id))
  return {
    lab: { slug: lab.slug, name: lab.name, createdAt: lab.createdAt.toISOString() },
    role,
    memberCount: members?.n ?? 0,
    systemCount: systems?.n ?? 0,
  }
})
