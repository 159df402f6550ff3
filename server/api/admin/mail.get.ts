/**
 * GET /api/admin/mail — the mail captured by the local fake SMTP server, for a
 * site administrator in development. 404 for everyone else, and 404 on a
 * server that sends real mail, so it does not even reveal that it exists.
 */
import type { CapturedMailListAnswer } from '#shared/types/account'

export default defineEventHandler(async (event): Promise<CapturedMailListAnswer> => {
  const user = await requireBrowserUser(event, 'administer the site')
  const dir = mailCaptureDir()
  if (!user.isAdmin || !dir) throw createError({ statusCode: 404, message: 'Page not found' })
  return { messages: await listCapturedMail(dir) }
})
