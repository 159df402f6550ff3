import { asc, eq } from 'drizzle-orm'
import { LabParams } from '#shared/utils/lab-schemas'
import type { MemberListAnswer } from '#shared/types/lab'

/** Every member of the lab with their role; any member may look. */
export default defineEventHandler(async (event): Promise<MemberListAnswer> => {
  const params = validateParams(event, LabParams)
  const { lab, role } = await requireLabRole(event, params.lab, 'viewer')
  const members = await useDb()
    .select({ id: tables.users.id, name: tables.users.name, email: tables.users.email, role: tables.labMembers.role })
    .from(tables.labMembers)
    .innerJoin(tables.users, eq(tables.users.id, tables.labMembers.userId))
    .where(eq(tables.labMembers.labId, lab.id))
    .orderBy(asc(tables.users.name))
  return { members, myRole: role }
})
