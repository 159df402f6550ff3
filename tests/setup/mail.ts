/**
 * Reading the mail the built server sent, from the fake SMTP server's folder
 * (started by global-server.ts). `waitForMail` waits for the message to land
 * because the server answers the request before the SMTP exchange is filed.
 */
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { inject } from 'vitest'
import type { CapturedMail } from '../../scripts/fake-smtp.mjs'

export function capturedMail(): CapturedMail[] {
  const dir = inject('mailDir')
  return readdirSync(dir).filter((name) => name.endsWith('.json')).sort()
    .map((name) => JSON.parse(readFileSync(join(dir, name), 'utf8')) as CapturedMail)
}

/** The newest mail to that address whose subject matches, waiting up to 10 s for it. */
export async function waitForMail(to: string, subject: RegExp): Promise<CapturedMail> {
  for (let tries = 0; tries < 100; tries++) {
    const found = capturedMail().filter((m) => m.to.includes(to) && subject.test(m.subject)).at(-1)
    if (found) return found
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`No mail to ${to} matching ${subject} arrived; got: ${capturedMail().map((m) => `${m.to.join(',')}: ${m.subject}`).join('; ') || 'none'}`)
}

/** The first link in the mail's text that goes to that path of the site, as a path with its query. */
export function linkTo(mail: CapturedMail, path: string): string {
  const match = new RegExp(`https?://[^\\s/]+(${path.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\?[^\\s]+)`).exec(mail.text)
  if (!match) throw new Error(`The mail "${mail.subject}" has no link to ${path}:\n${mail.text}`)
  return match[1]!
}
