import { and, eq } from 'drizzle-orm'
import { LabParams, MemberAddBody } from '#shared/utils/lab-schemas'

/** An owner adds an existing account to the lab with a role. */
export default defineEventHandler(async (event) => {
  const params = validateParams(event, LabParams)
  const { lab, user } = await requireLabRole(event, params.lab, 'owner')
  const body = await validateBody(event, MemberAddBody)
  const db = useDb()
  const [account] = await db.select({ id: tables.users.id, name: tables.users.name, email: tables.users.email })
    .from(tables.users).where(eq(tables.users.email, body.email))
  if (!account) {
    throw createError({ statusCode: 404, message: `No account uses ${body.email}; ask them to create one first`, data: { issues: [{ path: 'email', message: 'No account uses this address; ask them to create one first' }] } })
  }
  const [already] = await db.select({ role: tables.labMembers.role }).from(tables.labMembers)
    .where(and(eq(tables.labMembers.labId, lab.id), eq(tables.labMembers.userId, account.id)))
  if (already) {
    throw createError({ statusCode: 409, message: `${account.name} is already a member (${already.role}); change their role instead`, data: { issues: [{ path: 'email', message: `Already a member (${already.role})` }] } })
  }
  await db.insert(tables.labMembers).values({ labId: lab.id, userId: account.id, role: body.role })
  await recordAudit({ actorId: user.id, labId: lab.id, action: 'member.add', detail: { userId: account.id, role: body.role } })
  setResponseStatus(event, 201)
  return { member: { ...account, role: body.role } }
})
