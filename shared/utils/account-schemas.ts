/**
 * Validation of account forms, shared by the API routes and the pages so the
 * browser shows the same message the server would send.
 */
import { z } from 'zod'

export const PASSWORD_MIN_LENGTH = 10

export const EmailSchema = z.string().trim().toLowerCase()
  .pipe(z.email({ error: 'Enter an e-mail address such as ana@example.org' }).max(254, { error: 'E-mail address is too long' }))

export const NewPasswordSchema = z.string()
  .min(PASSWORD_MIN_LENGTH, { error: `Use at least ${PASSWORD_MIN_LENGTH} characters` })
  .max(200, { error: 'Use at most 200 characters' })

export const PersonNameSchema = z.string().trim()
  .min(1, { error: 'Enter your name' })
  .max(120, { error: 'Use at most 120 characters' })

export const RegisterBody = z.object({
  email: EmailSchema,
  name: PersonNameSchema,
  password: NewPasswordSchema,
})

export const LoginBody = z.object({
  email: EmailSchema,
  password: z.string().min(1, { error: 'Enter your password' }).max(200),
})

export const PasswordChangeBody = z.object({
  currentPassword: z.string().min(1, { error: 'Enter your current password' }).max(200),
  newPassword: NewPasswordSchema,
})

export type RegisterInput = z.infer<typeof RegisterBody>
export type LoginInput = z.infer<typeof LoginBody>
