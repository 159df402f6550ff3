/**
 * Invitations into a lab: an owner names an e-mail address and a role; the
 * link in the mail works once and for INVITATION_DAYS. Whoever holds the link
 * and is (or registers as) that address joins with that role.
 */
import type { H3Event } from 'h3'
import { and, eq, gt, isNull } from 'drizzle-orm'
import type { Invitation, Lab } from '../database/schema'
import { INVITATION_DAYS } from '../../shared/utils/invitation-schemas'
import { labRoleAtLeast, type LabRole } from '../../shared/utils/roles'
import { tables, useDb } from './db'
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
    .where(eq(tables.invitations.tokenHash, hashToken(token)))
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
 * Uses the invitation for this account: marks it used (only if nobody used it
 * in the meantime) and adds the membership, or raises an existing lower role.
 * Returns the role the account now has in the lab.
 */
export async function acceptInvitation(open: OpenInvitation, userId: number): Promise<LabRole> {
  return useDb().transaction(async (tx) => {
    const [result] = await tx.update(tables.invitations)
      .set({ acceptedAt: new Date(), acceptedBy: userId })
      .where(and(eq(tables.invitations.id, open.invitation.id), isNull(tables.invitations.acceptedAt), gt(tables.invitations.expiresAt, new Date())))
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
  })
}

/** Stores a new invitation and mails its link; says whether the mail went out. */
export async function createInvitation(event: H3Event, input: {
  lab: Lab
  email: string
  role: LabRole
  inviter: { id: number; name: string }
}): Promise<{ invitation: Invitation; mailed: boolean }> {
  const db = useDb()
  const { token, hash } = newToken()
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600 * 1000)
  const [inserted] = await db.insert(tables.invitations).values({
    labId: input.lab.id,
    email: input.email,
    role: input.role,
    tokenHash: hash,
    invitedBy: input.inviter.id,
    expiresAt,
  }).$returningId()
  const [invitation] = await db.select().from(tables.invitations).where(eq(tables.invitations.id, inserted!.id))
  const link = siteLink(event, `/invitations/accept?token=${token}`)
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
  return { invitation: invitation!, mailed: delivered }
}

/** The public shape of an invitation in an owner's list. */
export function invitationView(invitation: Invitation) {
  const state = invitation.acceptedAt ? 'accepted' : invitation.expiresAt.getTime() <= Date.now() ? 'expired' : 'pending'
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
