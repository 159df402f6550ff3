/**
 * POST /api/invitations/register — create the account the invitation was
 * sent to (its address, so the mail proved it), join the lab and sign in.
 */
import { eq } from 'drizzle-orm'
import { InvitationRegisterBody } from '#shared/utils/invitation-schemas'
import type { InvitationRegisteredAnswer } from '#shared/types/lab'

export default defineEventHandler(async (event): Promise<InvitationRegisteredAnswer> => {
  const body = await validateBody(event, InvitationRegisterBody)
  const open = await findOpenInvitation(body.token)
  const email = open.invitation.email
  const db = useDb()
  const taken = () => createError({ statusCode: 409, message: `An account with ${email} exists; sign in with it, then open the invitation link again` })
  const [existing] = await db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, email))
  if (existing) throw taken()
  const passwordHash = await hashPassword(body.password)
  // The account, its membership and both audit lines commit together: a used-up invitation leaves no account behind.
  const { id, role } = await db.transaction(async (tx) => {
    const [inserted] = await tx.insert(tables.users).values({ email, name: body.name, passwordHash }).$returningId()
    const id = inserted!.id
    await recordAudit(tx, { actorId: id, labId: null, action: 'user.register', detail: { via: 'invitation' } })
    const role = await acceptInvitation(tx, open, id)
    await recordAudit(tx, { actorId: id, labId: open.lab.id, action: 'invitation.accept', detail: { invitationId: open.invitation.id, role } })
    return { id, role }
  }).catch((error) => {
    if (isDuplicateKey(error)) throw taken()
    throw error
  })
  const user = { id, email, name: body.name }
  await startSession(event, user)
  setResponseStatus(event, 201)
  return { user: { ...user, isAdmin: false }, lab: { slug: open.lab.slug, name: open.lab.name }, role }
})
