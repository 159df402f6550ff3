import { eq } from 'drizzle-orm'
import { z } from 'zod'

const LAST_ADMIN_MESSAGE = 'This is the only site administrator. Make someone else an administrator first.'

export const Params = z.object({
  user: z.coerce.number({ error: 'User must be a number' }).int().positive({ error: 'User must be a positive number' }),
})
export const Body = z.object({ isAdmin: z.boolean({ error: 'isAdmin must be true or false' }) })

/**
 * Sets or clears an account's administrator flag. Clearing it on the last
 * administrator is refused (409); the admin rows are locked while counting,
 * so two administrators demoting each other at once cannot both succeed.
 * Answers the account as it was, or null when there is no such account.
 */
async function setSiteAdmin(actorId: number, userId: number, isAdmin: boolean): Promise<{ email: string, wasAdmin: boolean } | null> {
  return await useDb().transaction(async (tx) => {
    const [account] = await tx.select({ email: tables.users.email, isAdmin: tables.users.isAdmin })
      .from(tables.users).where(eq(tables.users.id, userId)).for('update')
    if (!account) return null
    if (account.isAdmin && !isAdmin) {
      const admins = await tx.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.isAdmin, true)).for('update')
      if (admins.length <= 1) throw createError({ statusCode: 409, message: LAST_ADMIN_MESSAGE })
    }
    if (account.isAdmin !== isAdmin) {
      await tx.update(tables.users).set({ isAdmin }).where(eq(tables.users.id, userId))
      await recordAudit(tx, { actorId, labId: null, action: isAdmin ? 'admin.grant' : 'admin.revoke', detail: { userId, email: account.email } })
    }
    return { email: account.email, wasAdmin: account.isAdmin }
  })
}

/**
 * PATCH /api/admin/users/[user] — a site administrator makes an account an
 * administrator or takes that away (`{ isAdmin }`). The last administrator
 * stays one (409). 404 for non-administrators and for unknown accounts.
 */
export default defineEventHandler(async (event) => {
  const actor = await requireBrowserUser(event, 'administer the site')
  if (!actor.isAdmin) throw createError({ statusCode: 404, message: 'Page not found' })
  const params = validateParams(event, Params)
  const body = await validateBody(event, Body)
  const before = await setSiteAdmin(actor.id, params.user, body.isAdmin)
  if (!before) throw createError({ statusCode: 404, message: 'No account has that id' })
  return { user: { id: params.user, isAdmin: body.isAdmin } }
})
