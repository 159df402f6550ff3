/**
 * Talking to the API as someone: `api()` never throws, so tests assert on the
 * status; `signUp()` makes a fresh account; `signInAs()` uses a demo account.
 */
import { url } from '@nuxt/test-utils/e2e'
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/database/seed'
import type { LabRole } from '../../shared/utils/roles'

export const SESSION_COOKIE = 'nuxt-session'

export interface ApiAnswer<T = any> {
  status: number
  body: T
  headers: Headers
}

export async function api<T = any>(path: string, options: { method?: string, body?: unknown, cookie?: string } = {}): Promise<ApiAnswer<T>> {
  const headers: Record<string, string> = { accept: 'application/json' }
  if (options.cookie) headers.cookie = options.cookie
  if (options.body !== undefined) headers['content-type'] = 'application/json'
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

export async function signUp(label = 'user'): Promise<SignedIn> {
  const password = 'a long enough password'
  const email = freshEmail(label)
  const answer = await api('/api/auth/register', { method: 'POST', body: { email, name: `Test ${label}`, password } })
  if (answer.status !== 201) throw new Error(`Registering ${email} failed: ${answer.status} ${JSON.stringify(answer.body)}`)
  return { cookie: sessionCookie(answer.headers), user: answer.body.user, password }
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

/** A new lab owned by `owner`, with the given others added in their roles. */
export async function makeLab(owner: SignedIn, others: { who: SignedIn, role: LabRole }[] = []): Promise<string> {
  const slug = `lab-${Date.now().toString(36)}-${++counter}`
  const created = await api('/api/labs', { method: 'POST', cookie: owner.cookie, body: { name: `Lab ${slug}`, slug } })
  if (created.status !== 201) throw new Error(`Creating lab failed: ${JSON.stringify(created.body)}`)
  for (const { who, role } of others) {
    const added = await api(`/api/labs/${slug}/members`, { method: 'POST', cookie: owner.cookie, body: { email: who.user.email, role } })
    if (added.status !== 201) throw new Error(`Adding member failed: ${JSON.stringify(added.body)}`)
  }
  return slug
}
