/**
 * Invitations into a lab: an owner names an e-mail address and a role; the
 * link in the mail works once and for INVITATION_DAYS. Whoever holds the link
 * and is (or registers as) that address joins with that role.
 */
import type { H3Event } from 'h3'
import { and, desc, eq, gt, isNull } from 'drizzle-orm'
import type { Invitation, Lab } from '../database/schema'
import { INVITATION_DAYS } from '../../shared/utils/invitation-schemas'
import { labRoleAtLeast, type LabRole } from '../../shared/utils/roles'
import type { InvitationState, InvitationView } from '../../shared/types/lab'
import { tables, useDb, type Transaction } from './db'
import { recordAudit } from './audit'
import { INVITATIONS_PER_HOUR, refuseForNow } from './limits'
import { sendMail, siteLink } from './mail'
import { hashToken, newToken } from './tokens'

export interface OpenInvitation {
  invitation: Invitation
  lab: Pick<Lab, 'id' | 'slug' | 'name'>
  inviterName: string | null
}

const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeZone: 'UTC' })

/**
 * The invitation a link token stands for, if it can still be used. An unknown
 * token is a 404; a used or expired one a 410 saying what happened and what to do.
 */
export async function findOpenInvitation(token: string): Promise<OpenInvitation> {
  const [row] = await useDb()
    .select({ invitation: tables.invitations, lab: { id: tables.labs.id, slug: tables.labs.slug, name: tables.labs.name }, inviterName: tables.users.name })
    .from(tables.invitations)
    .innerJoin(tables.labs, eq(tables.labs.id, tables.invitations.labId))
    .leftJoin(tables.users, eq(tables.users.id, tables.invitations.invitedBy))
    .where(and(eq(tables.invitations.tokenHash, hashToken(token)), isNull(tables.invitations.withdrawnAt)))
  if (!row) throw createError({ statusCode: 404, message: 'This invitation link is not valid; check that you opened the whole link from the mail' })
  const askAgain = `ask ${row.inviterName ?? 'an owner of the lab'} to invite you again`
  if (row.invitation.acceptedAt) {
    throw createError({ statusCode: 410, message: `This invitation to ${row.lab.name} was already used on ${dateFormat.format(row.invitation.acceptedAt)}; an invitation link works once. If that was not you, ${askAgain}` })
  }
  if (row.invitation.expiresAt.getTime() <= Date.now()) {
    throw createError({ statusCode: 410, message: `This invitation to ${row.lab.name} expired on ${dateFormat.format(row.invitation.expiresAt)}; ${askAgain}` })
  }
  return row
}

/**
 * Uses the invitation for this account, inside the caller's transaction:
 * marks it used (only if nobody used it in the meantime) and adds the
 * membership, or raises an existing lower role.
 * Returns the role the account now has in the lab.
 */
export async function acceptInvitation(tx: Transaction, open: OpenInvitation, userId: number): Promise<LabRole> {
  const [result] = await tx.update(tables.invitations)
    .set({ acceptedAt: new Date(), acceptedBy: userId })
    .where(and(eq(tables.invitations.id, open.invitation.id), isNull(tables.invitations.acceptedAt), isNull(tables.invitations.withdrawnAt), gt(tables.invitations.expiresAt, new Date())))
  if (result.affectedRows !== 1) {
    throw createError({ statusCode: 410, message: `This invitation to ${open.lab.name} was already used; an invitation link works once` })
  }
  const [member] = await tx.select({ role: tables.labMembers.role }).from(tables.labMembers)
    .where(and(eq(tables.labMembers.labId, open.lab.id), eq(tables.labMembers.userId, userId)))
  const invited = open.invitation.role
  if (!member) {
    await tx.insert(tables.labMembers).values({ labId: open.lab.id, userId, role: invited })
    return invited
  }
  if (labRoleAtLeast(member.role, invited)) return member.role
  await tx.update(tables.labMembers).set({ role: invited })
    .where(and(eq(tables.labMembers.labId, open.lab.id), eq(tables.labMembers.userId, userId)))
  return invited
}

/**
 * Invites an address into a lab, the one way an owner adds people (so nobody
 * learns whether an address has an account): refuses an address that is
 * already a member (409) and an owner or lab past INVITATIONS_PER_HOUR (429),
 * stores the invitation with its audit line and mails its link. Says whether
 * the mail went out.
 */
export async function inviteToLab(event: H3Event, input: {
  lab: Lab
  email: string
  role: LabRole
  inviter: { id: number; name: string }
}): Promise<{ invitation: Invitation; mailed: boolean }> {
  const db = useDb()
  const [member] = await db.select({ name: tables.users.name, role: tables.labMembers.role })
    .from(tables.labMembers)
    .innerJoin(tables.users, eq(tables.users.id, tables.labMembers.userId))
    .where(and(eq(tables.labMembers.labId, input.lab.id), eq(tables.users.email, input.email)))
  if (member) {
    throw createError({ statusCode: 409, message: `${member.name} (${input.email}) is already a member (${member.role}); change their role instead`, data: { issues: [{ path: 'email', message: `Already a member (${member.role})` }] } })
  }
  return createInvitation(event, input)
}

/** Seconds until fewer than `limit` of these creation times fall in the last hour (0: none to wait). */
function hourlyWait(newestFirst: { createdAt: Date }[], limit: number, now: number): number {
  if (newestFirst.length < limit) return 0
  return Math.max(1, Math.ceil((newestFirst[limit - 1]!.createdAt.getTime() + 3600_000 - now) / 1000))
}

/**
 * Stores a new invitation with its audit line (one transaction), then mails
 * its link; says whether the mail went out. The count against
 * INVITATIONS_PER_HOUR and the insert happen under locks on the inviter's and
 * the lab's rows, so parallel requests cannot overshoot.
 */
async function createInvitation(event: H3Event, input: {
  lab: Lab
  email: string
  role: LabRole
  inviter: { id: number; name: string }
}): Promise<{ invitation: Invitation; mailed: boolean }> {
  const { token, hash } = newToken()
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600 * 1000)
  const invitation = await useDb().transaction(async (tx) => {
    await tx.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, input.inviter.id)).for('update')
    await tx.select({ id: tables.labs.id }).from(tables.labs).where(eq(tables.labs.id, input.lab.id)).for('update')
    const hourAgo = new Date(Date.now() - 3600_000)
    const recent = (column: typeof tables.invitations.invitedBy | typeof tables.invitations.labId, id: number, limit: number) =>
      tx.select({ createdAt: tables.invitations.createdAt }).from(tables.invitations)
        .where(and(eq(column, id), gt(tables.invitations.createdAt, hourAgo)))
        .orderBy(desc(tables.invitations.createdAt)).limit(limit)
    const now = Date.now()
    const byUser = hourlyWait(await recent(tables.invitations.invitedBy, input.inviter.id, INVITATIONS_PER_HOUR.perUser), INVITATIONS_PER_HOUR.perUser, now)
    if (byUser) refuseForNow(event, `You have sent ${INVITATIONS_PER_HOUR.perUser} invitations in the last hour, the most one person may send.`, byUser)
    const byLab = hourlyWait(await recent(tables.invitations.labId, input.lab.id, INVITATIONS_PER_HOUR.perLab), INVITATIONS_PER_HOUR.perLab, now)
    if (byLab) refuseForNow(event, `${input.lab.name} has sent ${INVITATIONS_PER_HOUR.perLab} invitations in the last hour, the most one lab may send.`, byLab)
    const [inserted] = await tx.insert(tables.invitations).values({
      labId: input.lab.id,
      email: input.email,
      role: input.role,
      tokenHash: hash,
      invitedBy: input.inviter.id,
      expiresAt,
    }).$returningId()
    await recordAudit(tx, { actorId: input.inviter.id, labId: input.lab.id, action: 'invitation.create', detail: { invitationId: inserted!.id, email: input.email, role: input.role } })
    const [row] = await tx.select().from(tables.invitations).where(eq(tables.invitations.id, inserted!.id))
    return row!
  })
  const link = siteLink(`/invitations/accept?token=${token}`)
  const { delivered } = await sendMail({
    to: input.email,
    subject: `${input.inviter.name} invites you to ${input.lab.name} on Equipoise`,
    text: [
      `${input.inviter.name} invites you to join the lab "${input.lab.name}" on Equipoise as ${input.role}.`,
      '',
      `Open this link to accept (it works once, until ${dateFormat.format(expiresAt)}):`,
      link,
      '',
      `If you have no account yet, the link lets you create one with this address (${input.email}).`,
      'If you did not expect this invitation, ignore this mail.',
    ].join('\n'),
    html: `<p>${escapeHtml(input.inviter.name)} invites you to join the lab <strong>${escapeHtml(input.lab.name)}</strong> on Equipoise as <strong>${input.role}</strong>.</p>`
      + `<p><a href="${escapeHtml(link)}">Accept the invitation</a> — the link works once, until ${dateFormat.format(expiresAt)}.</p>`
      + `<p>If you have no account yet, the link lets you create one with this address (${escapeHtml(input.email)}). If you did not expect this invitation, ignore this mail.</p>`,
  })
  return { invitation, mailed: delivered }
}

/** The public shape of an invitation in an owner's list. */
export function invitationView(invitation: Invitation): InvitationView {
  const state: InvitationState = invitation.acceptedAt ? 'accepted' : invitation.expiresAt.getTime() <= Date.now() ? 'expired' : 'pending'
  return {
    id: invitation.id,
    email: invitation.email,
    role: invitation.role,
    state,
    expiresAt: invitation.expiresAt.toISOString(),
    createdAt: invitation.createdAt.toISOString(),
  }
}

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!)
}
