/**
 * Authentication: the session says who the user was when they signed in; the
 * account row says who they are now (deleted accounts and the admin flag).
 */
import type { H3Event } from 'h3'
import { eq } from 'drizzle-orm'

export interface CurrentUser {
  id: number
  email: string
  name: string
  isAdmin: boolean
}

/** The signed-in user, or a 401 asking them to sign in. */
export async function requireUser(event: H3Event): Promise<CurrentUser> {
  const session = await getUserSession(event)
  const sessionUser = session.user
  if (!sessionUser) throw createError({ statusCode: 401, message: 'Sign in to continue' })
  const [row] = await useDb()
    .select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, isAdmin: tables.users.isAdmin })
    .from(tables.users)
    .where(eq(tables.users.id, sessionUser.id))
  if (!row) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: 'Your account no longer exists; sign in again' })
  }
  return row
}
