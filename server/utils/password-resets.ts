/**
 * Password reset by mail: a link that works once and for
 * PASSWORD_RESET_MINUTES. Asking for one answers the same whether or not the
 * address has an account, so the form cannot be used to find out who has one.
 */
import { and, count, eq, gt, isNull } from 'drizzle-orm'
import { PASSWORD_RESET_MINUTES } from '../../shared/utils/invitation-schemas'
import { recordAudit } from './audit'
import { tables, useDb } from './db'
import { sendMail, siteLink } from './mail'
import { hashToken, newToken } from './tokens'
import { RESET_MAILS } from './limits'


/** The one answer to "send me a reset link", for known and unknown addresses alike. */
export const RESET_REQUESTED_MESSAGE = `If an account uses this address, a link to choose a new password is on its way; it works once, for ${PASSWORD_RESET_MINUTES} minutes`

/**
 * Mails a reset link when the address has an account (and has not had too
 * many lately); does nothing visible otherwise. The route runs it after
 * answering, so known and unknown addresses answer alike and as fast.
 */
export async function requestPasswordReset(email: string): Promise<void> {
  const db = useDb()
  const [account] = await db.select({ id: tables.users.id, name: tables.users.name }).from(tables.users).where(eq(tables.users.email, email))
  if (!account) return
  const since = new Date(Date.now() - RESET_MAILS.windowMinutes * 60 * 1000)
  const { token, hash } = newToken()
  // Counted and stored under a lock on the account's row, so parallel requests cannot pass the limit.
  const stored = await db.transaction(async (tx) => {
    await tx.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, account.id)).for('update')
    const [recent] = await tx.select({ n: count() }).from(tables.passwordResets)
      .where(and(eq(tables.passwordResets.userId, account.id), gt(tables.passwordResets.createdAt, since)))
    if ((recent?.n ?? 0) >= RESET_MAILS.perWindow) return false
    await tx.insert(tables.passwordResets).values({
      userId: account.id,
      tokenHash: hash,
      expiresAt: new Date(Date.now() + PASSWORD_RESET_MINUTES * 60 * 1000),
    })
    return true
  })
  if (!stored) return
  const link = siteLink(`/password/reset?token=${token}`)
  await sendMail({
    to: email,
    subject: 'Choose a new password for Equipoise',
    text: [
      `Hello ${account.name},`,
      '',
      `Someone (we hope you) asked to choose a new password for ${email} on Equipoise.`,
      `Open this link to do it; it works once, for ${PASSWORD_RESET_MINUTES} minutes:`,
      link,
      '',
      'If you did not ask, ignore this mail: your password stays as it is.',
    ].join('\n'),
  })
}

const LINK_UNUSABLE = 'This reset link has expired or was already used; ask for a new one on the "Forgot your password?" page'

/**
 * Sets a new password with a reset link's token. The link is used up first
 * (only one request can win), then every other open link of the account is
 * closed too, and every session of the account ends; with the audit line, all
 * in one transaction. Returns the account's id.
 */
export async function resetPassword(token: string, passwordHash: string): Promise<number> {
  const db = useDb()
  const [reset] = await db.select().from(tables.passwordResets).where(eq(tables.passwordResets.tokenHash, hashToken(token)))
  if (!reset) throw createError({ statusCode: 404, message: 'This reset link is not valid; check that you opened the whole link from the mail, or ask for a new one' })
  return db.transaction(async (tx) => {
    const now = new Date()
    const [used] = await tx.update(tables.passwordResets).set({ usedAt: now })
      .where(and(eq(tables.passwordResets.id, reset.id), isNull(tables.passwordResets.usedAt), gt(tables.passwordResets.expiresAt, now)))
    if (used.affectedRows !== 1) throw createError({ statusCode: 410, message: LINK_UNUSABLE })
    await tx.update(tables.users).set({ passwordHash }).where(eq(tables.users.id, reset.userId))
    // Whoever knew the old password (or holds a copied cookie) is signed out everywhere.
    await tx.delete(tables.sessions).where(eq(tables.sessions.userId, reset.userId))
    await tx.update(tables.passwordResets).set({ usedAt: now })
      .where(and(eq(tables.passwordResets.userId, reset.userId), isNull(tables.passwordResets.usedAt)))
    await recordAudit(tx, { actorId: reset.userId, labId: null, action: 'user.password-reset' })
    return reset.userId
  })
}
