import { and, count, eq } from 'drizzle-orm'
import type { LabRole } from '../../shared/utils/roles'
import { tables, useDb } from './db'

/** The membership of one user in one lab, or a 404 naming what is missing. */
export async function findMembership(labId: number, userId: number): Promise<{ role: LabRole }> {
  const [row] = await useDb().select({ role: tables.labMembers.role }).from(tables.labMembers)
    .where(and(eq(tables.labMembers.labId, labId), eq(tables.labMembers.userId, userId)))
  if (!row) throw createError({ statusCode: 404, message: 'That person is not a member of this lab' })
  return row
}

export async function countOwners(labId: number): Promise<number> {
  const [row] = await useDb().select({ n: count() }).from(tables.labMembers)
    .where(and(eq(tables.labMembers.labId, labId), eq(tables.labMembers.role, 'owner')))
  return row?.n ?? 0
}

export const LAST_OWNER_MESSAGE = 'A lab needs at least one owner: make someone else owner first'
