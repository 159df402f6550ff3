/**
 * Talking to the API as someone: `api()` never throws, so tests assert on the
 * status; `signUp()` makes a fresh account (through the mailed confirmation
 * link, as a person would); `signInAs()` uses a demo account; `makeLab()`
 * brings members in through mailed invitations.
 */
import { url } from '@nuxt/test-utils/e2e'
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/database/seed'
import type { LabRole } from '../../shared/utils/roles'
import { linkTo, waitForMail } from './mail'

export const SESSION_COOKIE = 'nuxt-session'

export interface ApiAnswer<T = any> {
  status: number
  body: T
  headers: Headers
}

/** The site's own origin, which a browser sends as Origin with every write (see server/middleware/01.same-origin.ts). */
export function siteOrigin(): string {
  return new URL(url('/')).origin
}

/**
 * Like the app's pages in a browser, sends the site's own Origin. `headers` adds or replaces request
 * headers, e.g. `x-forwarded-for` to stand for a client address (the test server trusts its loopback proxy).
 */
export async function api<T = any>(path: string, options: { method?: string, body?: unknown, cookie?: string, headers?: Record<string, string> } = {}): Promise<ApiAnswer<T>> {
  const headers: Record<string, string> = { accept: 'application/json', origin: siteOrigin(), ...options.headers }
  if (options.cookie) headers.cookie = options.cookie
  if (options.body !== undefined) headers['content-type'] ??= 'application/json'
  const response = await fetch(url(path), {
    method: options.method ?? 'GET',
    headers,
    body: options.body === undefined ? undefined : JSON.stringify(options.body),
  })
  const text = await response.text()
  let body: unknown = text
  try {
    body = JSON.parse(text)
  } catch {
    // not JSON: keep the text
  }
  return { status: response.status, body: body as T, headers: response.headers }
}

/** The `name=value` of the session cookie a response set. */
export function sessionCookie(headers: Headers): string {
  const cookie = headers.getSetCookie().find((c) => c.startsWith(`${SESSION_COOKIE}=`))
  if (!cookie) throw new Error('The response set no session cookie')
  return cookie.split(';')[0]!
}

let counter = 0

/**
 * A random client address (in 2001:db8::/32, the documentation range) for
 * each sign-up, so the per-address registration limit does not add up the
 * sign-ups of every test file. Sent as X-Forwarded-For, which the test server
 * believes from loopback.
 */
export function freshClientAddress(): string {
  const part = () => Math.floor(Math.random() * 0x10000).toString(16)
  return `2001:db8:${part()}:${part()}::${part()}`
}

/** A unique e-mail address for this run, so tests never collide. */
export function freshEmail(label = 'user'): string {
  counter += 1
  return `${label}-${Date.now().toString(36)}-${counter}@tests.equipoise.test`
}

export interface SignedIn {
  cookie: string
  user: { id: number, email: string, name: string, isAdmin: boolean }
  password: string
}

/** The token of the newest confirmation link mailed to this address. */
export async function confirmationToken(email: string): Promise<string> {
  const mail = await waitForMail(email, /^Confirm your address/)
  return new URL(linkTo(mail, '/register/confirm'), 'http://x').searchParams.get('token')!
}

/** Registers a fresh account and confirms it through the mailed link, as a person would; signed in. */
export async function signUp(label = 'user'): Promise<SignedIn> {
  const password = 'a long enough password'
  const email = freshEmail(label)
  const answer = await api('/api/auth/register', { method: 'POST', body: { email, name: `Test ${label}`, password }, headers: { 'x-forwarded-for': freshClientAddress() } })
  if (answer.status !== 202) throw new Error(`Registering ${email} failed: ${answer.status} ${JSON.stringify(answer.body)}`)
  const confirmed = await api('/api/auth/register/confirm', { method: 'POST', body: { token: await confirmationToken(email) } })
  if (confirmed.status !== 201) throw new Error(`Confirming ${email} failed: ${confirmed.status} ${JSON.stringify(confirmed.body)}`)
  return { cookie: sessionCookie(confirmed.headers), user: confirmed.body.user, password }
}

export async function signIn(email: string, password: string): Promise<SignedIn> {
  const answer = await api('/api/auth/login', { method: 'POST', body: { email, password } })
  if (answer.status !== 200) throw new Error(`Signing in ${email} failed: ${answer.status} ${JSON.stringify(answer.body)}`)
  return { cookie: sessionCookie(answer.headers), user: answer.body.user, password }
}

/** Signs in as the seeded demo account with this lab role (or 'admin', the site administrator). */
export function signInAs(who: LabRole | 'admin'): Promise<SignedIn> {
  const account = who === 'admin' ? DEMO_ACCOUNTS.find((a) => a.isAdmin) : DEMO_ACCOUNTS.find((a) => a.role === who)
  if (!account) throw new Error(`No demo account for ${who}`)
  return signIn(account.email, DEMO_PASSWORD)
}

/** Invites `who` into the lab and accepts with their session through the mailed link, as a person would. */
export async function joinByInvitation(owner: SignedIn, slug: string, who: SignedIn, role: LabRole): Promise<void> {
  const lab = (await api(`/api/labs/${slug}`, { cookie: owner.cookie })).body.lab as { slug: string, name: string }
  const invited = await api(`/api/labs/${lab.slug}/members`, { method: 'POST', cookie: owner.cookie, body: { email: who.user.email, role } })
  if (invited.status !== 201) throw new Error(`Inviting ${who.user.email} failed: ${invited.status} ${JSON.stringify(invited.body)}`)
  const mail = await waitForMail(who.user.email, new RegExp(`invites you to ${lab.name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')} on`))
  const token = new URL(linkTo(mail, '/invitations/accept'), 'http://x').searchParams.get('token')!
  const accepted = await api('/api/invitations/accept', { method: 'POST', cookie: who.cookie, body: { token } })
  if (accepted.status !== 200) throw new Error(`Accepting for ${who.user.email} failed: ${accepted.status} ${JSON.stringify(accepted.body)}`)
}

/** A new lab owned by `owner`, with the given others invited and joined in their roles. */
export async function makeLab(owner: SignedIn, others: { who: SignedIn, role: LabRole }[] = []): Promise<string> {
  const slug = `lab-${Date.now().toString(36)}-${++counter}`
  const name = `Lab ${slug}`
  const created = await api('/api/labs', { method: 'POST', cookie: owner.cookie, body: { name, slug } })
  if (created.status !== 201) throw new Error(`Creating lab failed: ${JSON.stringify(created.body)}`)
  for (const { who, role } of others) await joinByInvitation(owner, slug, who, role)
  return slug
}
