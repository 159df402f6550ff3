/**
 * Registration with a confirmed address. Asking to register answers the same
 * for every address; the work happens after the answer. A new address gets a
 * confirmation link and the account is created only when that link is opened
 * (with that registration's name and password); an address that has an
 * account gets a mail saying someone tried to register it. At most
 * REGISTRATION_MAILS_PER_HOUR such mails go to one address in an hour.
 */
import { and, eq, gt, isNull } from 'drizzle-orm'
import { createHash } from 'node:crypto'
import type { RegisterInput } from '../../shared/utils/account-schemas'
import { recordAudit } from './audit'
import { tables, useDb } from './db'
import { isDuplicateKey } from './revisions'
import { REGISTRATION_CONFIRM_HOURS } from '../../shared/utils/invitation-schemas'
import { REGISTRATION_MAILS_PER_HOUR } from './limits'
import { sendMail, siteLink } from './mail'
import { bumpCounter } from './throttle-counters'
import { hashToken, newToken } from './tokens'

/** The one answer to a registration, for new and existing addresses alike. */
export const REGISTRATION_REQUESTED_MESSAGE = `Check your mail: we sent a link to confirm the address (it works for ${REGISTRATION_CONFIRM_HOURS} hours). Open it to finish creating your account. If the address already has an account, the mail says so.`

/** Does the work of a registration; never throws (it runs after the answer was sent). */
export async function requestRegistration(input: RegisterInput): Promise<void> {
  const db = useDb()
  // Counted atomically before any mail, so parallel requests cannot send more than the limit.
  const key = `register-mail:${createHash('sha256').update(input.email).digest('hex')}`
  if (await bumpCounter(key, 60, 'window') > REGISTRATION_MAILS_PER_HOUR) return
  const passwordHash = await hashPassword(input.password)
  const [existing] = await db.select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.email, input.email))
  if (existing) {
    await sendMail({
      to: input.email,
      subject: 'Someone tried to create an Equipoise account with your address',
      text: [
        `Hello ${existing.name},`,
        '',
        `Someone (perhaps you) tried to create a new Equipoise account with ${input.email}, which already has one. Nothing was changed.`,
        '',
        `To sign in: ${siteLink('/login')}`,
        `Forgot your password? Choose a new one here: ${siteLink('/password/forgot')}`,
        '',
        'If it was not you, ignore this mail.',
      ].join('\n'),
    })
    return
  }
  const { token, hash } = newToken()
  await db.insert(tables.pendingRegistrations).values({
    email: input.email,
    name: input.name,
    passwordHash,
    tokenHash: hash,
    expiresAt: new Date(Date.now() + REGISTRATION_CONFIRM_HOURS * 3600_000),
  })
  const link = siteLink(`/register/confirm?token=${token}`)
  await sendMail({
    to: input.email,
    subject: 'Confirm your address to create your Equipoise account',
    text: [
      `Hello ${input.name},`,
      '',
      `Someone (we hope you) asked to create an Equipoise account with ${input.email}.`,
      `Open this link to confirm the address and finish; it works once, for ${REGISTRATION_CONFIRM_HOURS} hours:`,
      link,
      '',
      'If you did not ask, ignore this mail: no account is created.',
    ].join('\n'),
  })
}

/**
 * Creates the account of a registration from its confirmation token (once),
 * with its audit line, and returns it. Other open links for the same address
 * stop working.
 */
export async function confirmRegistration(token: string): Promise<{ id: number, email: string, name: string }> {
  const db = useDb()
  const [pending] = await db.select().from(tables.pendingRegistrations).where(eq(tables.pendingRegistrations.tokenHash, hashToken(token)))
  if (!pending) throw createError({ statusCode: 404, message: 'This confirmation link is not valid; open the whole link from the mail, or register again' })
  if (pending.usedAt) throw createError({ statusCode: 410, message: 'This confirmation link was already used; sign in with the address and password you chose' })
  if (pending.expiresAt.getTime() <= Date.now()) throw createError({ statusCode: 410, message: `This confirmation link has expired (links work for ${REGISTRATION_CONFIRM_HOURS} hours); register again to get a new one` })
  return db.transaction(async (tx) => {
    const now = new Date()
    const [used] = await tx.update(tables.pendingRegistrations).set({ usedAt: now })
      .where(and(eq(tables.pendingRegistrations.id, pending.id), isNull(tables.pendingRegistrations.usedAt), gt(tables.pendingRegistrations.expiresAt, now)))
    if (used.affectedRows !== 1) throw createError({ statusCode: 410, message: 'This confirmation link was already used; sign in with the address and password you chose' })
    let id: number
    try {
      const [inserted] = await tx.insert(tables.users).values({ email: pending.email, name: pending.name, passwordHash: pending.passwordHash }).$returningId()
      id = inserted!.id
    } catch (error) {
      if (isDuplicateKey(error)) throw createError({ statusCode: 409, message: `${pending.email} has an account already; sign in with it` })
      throw error
    }
    await tx.update(tables.pendingRegistrations).set({ usedAt: now })
      .where(and(eq(tables.pendingRegistrations.email, pending.email), isNull(tables.pendingRegistrations.usedAt)))
    await recordAudit(tx, { actorId: id, labId: null, action: 'user.register' })
    return { id, email: pending.email, name: pending.name }
  })
}
