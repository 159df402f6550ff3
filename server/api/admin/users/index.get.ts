import { asc, eq, inArray } from 'drizzle-orm'
import type { AdminUserListAnswer, AdminUserView } from '#shared/types/account'

/** Every account with its labs, oldest first (the first accounts are usually the administrators). */
async function listUsersForAdmin(): Promise<AdminUserView[]> {
  const db = useDb()
  const users = await db
    .select({ id: tables.users.id, name: tables.users.name, email: tables.users.email, isAdmin: tables.users.isAdmin, createdAt: tables.users.createdAt })
    .from(tables.users)
    .orderBy(asc(tables.users.createdAt), asc(tables.users.id))
  const ids = users.map((u) => u.id)
  const memberships = ids.length
    ? await db
      .select({ userId: tables.labMembers.userId, slug: tables.labs.slug, name: tables.labs.name, role: tables.labMembers.role })
      .from(tables.labMembers)
      .innerJoin(tables.labs, eq(tables.labs.id, tables.labMembers.labId))
      .where(inArray(tables.labMembers.userId, ids))
      .orderBy(asc(tables.labs.name))
    : []
  return users.map((u) => ({
    ...u,
    createdAt: new Date(u.createdAt).toISOString(),
    labs: memberships.filter((m) => m.userId === u.id).map(({ slug, name, role }) => ({ slug, name, role })),
  }))
}

/**
 * GET /api/admin/users — every account with its labs, for a site
 * administrator. 404 for everyone else, so the page does not reveal itself.
 */
export default defineEventHandler(async (event): Promise<AdminUserListAnswer> => {
  const user = await requireBrowserUser(event, 'administer the site')
  if (!user.isAdmin) throw createError({ statusCode: 404, message: 'Page not found' })
  return { users: await listUsersForAdmin() }
})
