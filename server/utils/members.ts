import { and, eq } from 'drizzle-orm'
import type { LabRole } from '../../shared/utils/roles'
import { tables, type Transaction } from './db'

/** The membership of one user in one lab, locked until the transaction ends, or a 404 naming what is missing. */
export async function findMembership(tx: Transaction, labId: number, userId: number): Promise<{ role: LabRole }> {
  const [row] = await tx.select({ role: tables.labMembers.role }).from(tables.labMembers)
    .where(and(eq(tables.labMembers.labId, labId), eq(tables.labMembers.userId, userId))).for('update')
  if (!row) throw createError({ statusCode: 404, message: 'That person is not a member of this lab' })
  return row
}

/**
 * The number of owners of a lab, with their rows locked until the
 * transaction ends: a second removal or demotion waits, then counts again.
 */
export async function lockOwners(tx: Transaction, labId: number): Promise<number> {
  const owners = await tx.select({ userId: tables.labMembers.userId }).from(tables.labMembers)
    .where(and(eq(tables.labMembers.labId, labId), eq(tables.labMembers.role, 'owner'))).for('update')
  return owners.length
}

export const LAST_OWNER_MESSAGE = 'A lab needs at least one owner: make someone else owner first'
