/**
 * GET /api/invitations/:token — what an invitation link offers (lab, role,
 * address), for the accept page. Anyone holding the link may ask; a used or
 * expired link answers 410 with what to do. It does not say whether the
 * address has an account (the page offers both signing in and registering).
 */
import { z } from 'zod'
import { LinkTokenSchema } from '#shared/utils/invitation-schemas'
import type { InvitationOffer } from '#shared/types/lab'

export const Params = z.object({ token: LinkTokenSchema })

export default defineEventHandler(async (event): Promise<InvitationOffer> => {
  const { token } = validateParams(event, Params)
  const open = await findOpenInvitation(token)
  return {
    lab: { slug: open.lab.slug, name: open.lab.name },
    email: open.invitation.email,
    role: open.invitation.role,
    invitedBy: open.inviterName,
    expiresAt: open.invitation.expiresAt.toISOString(),
  }
})
