/**
 * Authorisation inside labs. A lab the user cannot see answers 404 (never
 * 403) so its existence is not revealed; a member whose role is too low gets
 * 403 saying which role the action needs.
 */
import type { H3Event } from 'h3'
import { and, desc, eq } from 'drizzle-orm'
import type { Lab, System, Revision } from '../database/schema'
import { effectiveLabRole, labRoleAtLeast, type LabRole } from '../../shared/utils/roles'
import { requireUser, type CurrentUser } from './current-user'
import { tables, useDb } from './db'

export interface LabAccess {
  user: CurrentUser
  lab: Lab
  /** The role the user acts with (site administrators act as owner). */
  role: LabRole
}

export async function requireLabRole(event: H3Event, labSlug: string, minRole: LabRole): Promise<LabAccess> {
  const user = await requireUser(event)
  const db = useDb()
  const [row] = await db
    .select({ lab: tables.labs, membership: tables.labMembers.role })
    .from(tables.labs)
    .leftJoin(tables.labMembers, and(eq(tables.labMembers.labId, tables.labs.id), eq(tables.labMembers.userId, user.id)))
    .where(eq(tables.labs.slug, labSlug))
  const role = row ? effectiveLabRole(row.membership, user.isAdmin) : null
  if (!row || !role) throw createError({ statusCode: 404, message: `No lab "${labSlug}" that you are a member of` })
  if (!labRoleAtLeast(role, minRole)) {
    throw createError({ statusCode: 403, message: `This needs the ${minRole} role in ${row.lab.name}; you are ${role}` })
  }
  return { user, lab: row.lab, role }
}

export interface SystemAccess extends LabAccess {
  system: System
  latest: Revision
}

export async function requireSystem(event: H3Event, labSlug: string, systemSlug: string, minRole: LabRole): Promise<SystemAccess> {
  const access = await requireLabRole(event, labSlug, minRole)
  const db = useDb()
  const [system] = await db.select().from(tables.systems)
    .where(and(eq(tables.systems.labId, access.lab.id), eq(tables.systems.slug, systemSlug)))
  if (!system) throw createError({ statusCode: 404, message: `No system "${systemSlug}" in ${access.lab.name}` })
  const [latest] = await db.select().from(tables.revisions)
    .where(eq(tables.revisions.systemId, system.id))
    .orderBy(desc(tables.revisions.number))
    .limit(1)
  if (!latest) throw createError({ statusCode: 500, message: `System "${systemSlug}" has no revision` })
  return { ...access, system, latest }
}
