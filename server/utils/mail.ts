/**
 * Outgoing mail over SMTP with nodemailer. Host, port, sender and login come
 * from runtime config (NUXT_MAIL_HOST, NUXT_MAIL_PORT, NUXT_MAIL_FROM,
 * NUXT_MAIL_USER, NUXT_MAIL_PASSWORD, NUXT_MAIL_SECURE), so a real provider is
 * set in production; `npm start`, `npm run dev` and the tests point them at
 * the local fake SMTP server (scripts/fake-smtp.mjs).
 *
 * Sending never throws: a notification that cannot be delivered must not
 * undo the action that caused it. The caller learns whether it went out.
 */
import { createTransport, type Transporter } from 'nodemailer'

export interface MailMessage {
  to: string
  subject: string
  text: string
  html?: string
}

export interface MailOutcome {
  delivered: boolean
  /** Why it was not delivered, for the server log and an owner-facing hint. */
  problem?: string
}

interface MailConfig {
  host: string
  port: number | string
  from: string
  user: string
  password: string
  secure: boolean | string
}

let transport: { key: string; transporter: Transporter } | undefined

function transporterFor(config: MailConfig): Transporter {
  const key = `${config.host}:${config.port}:${config.user}:${config.secure}`
  if (transport?.key === key) return transport.transporter
  const transporter = createTransport({
    host: config.host,
    port: Number(config.port),
    secure: config.secure === true || config.secure === 'true',
    auth: config.user ? { user: config.user, pass: config.password } : undefined,
    // The local fake server speaks plain SMTP on loopback; a real provider is reached with STARTTLS when it offers it.
    ignoreTLS: config.host === '127.0.0.1' || config.host === 'localhost',
    // nodemailer waits up to two minutes by default; a request that mails should not hang that long on a dead server.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
  transport = { key, transporter }
  return transporter
}

/** Sends one message; resolves with whether the SMTP server accepted it. */
export async function sendMail(message: MailMessage): Promise<MailOutcome> {
  const config = useRuntimeConfig().mail as MailConfig
  if (!config.host) {
    const problem = 'no mail server is configured (set NUXT_MAIL_HOST)'
    console.warn(`[mail] not sent to ${message.to} ("${message.subject}"): ${problem}`)
    return { delivered: false, problem }
  }
  try {
    await transporterFor(config).sendMail({ from: config.from, ...message })
    return { delivered: true }
  } catch (error) {
    const problem = error instanceof Error ? error.message : String(error)
    console.error(`[mail] could not send to ${message.to} ("${message.subject}"): ${problem}`)
    return { delivered: false, problem: 'the mail server refused or could not be reached' }
  }
}

/**
 * The absolute address of a page of this site, for links in mail: always on
 * the configured site origin (NUXT_PUBLIC_SITE_URL), never on the Host header
 * of the request, which whoever sends it chooses.
 */
export function siteLink(path: string): string {
  return `${siteOrigin()}${path}`
}
