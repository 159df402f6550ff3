/**
 * A message the local fake SMTP server kept (scripts/fake-smtp.mjs writes one
 * JSON file a message), as GET /api/admin/mail and the tests read it.
 */
export interface CapturedMail {
  id: string
  receivedAt: string
  from: string
  to: string[]
  subject: string
  text: string
  html: string | null
}
