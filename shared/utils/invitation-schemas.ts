/**
 * Validation of invitations and password resets, shared by the API routes
 * and the pages.
 */
import { z } from 'zod'
import { EmailSchema, NewPasswordSchema, PersonNameSchema } from './account-schemas'
import { LabRoleSchema } from './lab-schemas'

/** How long an invitation link works. */
export const INVITATION_DAYS = 7
/** How long a password reset link works. */
export const PASSWORD_RESET_MINUTES = 60
/** How long a registration's confirmation link works. */
export const REGISTRATION_CONFIRM_HOURS = 24

/** A link token: the base64url text of 32 random bytes. */
export const LinkTokenSchema = z.string().trim()
  .regex(/^[A-Za-z0-9_-]{43}$/, { error: 'This link is not valid; open the whole link from the mail, or ask for a new one' })

export const InvitationCreateBody = z.object({
  email: EmailSchema,
  role: LabRoleSchema,
})

/** Confirm a registration's address with the token from its mail. */
export const RegisterConfirmBody = z.object({ token: LinkTokenSchema })

export const InvitationAcceptBody = z.object({ token: LinkTokenSchema })

/** Create the account the invitation was sent to, and join. */
export const InvitationRegisterBody = z.object({
  token: LinkTokenSchema,
  name: PersonNameSchema,
  password: NewPasswordSchema,
})

export const PasswordForgotBody = z.object({ email: EmailSchema })

export const PasswordResetBody = z.object({
  token: LinkTokenSchema,
  password: NewPasswordSchema,
})
