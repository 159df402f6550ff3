/**
 * The rate limits of accounts and mail, in one place: how fast sign-in may be
 * guessed, how many invitations a person or a lab may send, how many mails a
 * registration may cause. Counted in MariaDB (throttle_counters, invitations,
 * pending_registrations), so they survive a restart and hold across server
 * processes. A refusal is a 429 with Retry-After and a message saying when to
 * try again (`refuseForNow`).
 */
import type { H3Event } from 'h3'

/** A counter of failures: free ones first, then a delay after each further failure that doubles up to a ceiling. */
export interface FailureRule {
  /** Failures allowed before any delay. */
  freeFailures: number
  /** The wait after the first failure past the free ones; each further one doubles it. */
  firstDelaySeconds: number
  maxDelaySeconds: number
  /** A counter with no failure for this long starts over. */
  forgetAfterMinutes: number
}

export const LOGIN_THROTTLE = {
  /**
   * Failed sign-ins for one account from one client address: the owner's
   * own typing mistakes cost nothing, a guesser waits 30 s, 1 min, 2 min, …
   * up to 15 min between tries, and the owner elsewhere is not affected.
   */
  accountAndAddress: { freeFailures: 5, firstDelaySeconds: 30, maxDelaySeconds: 15 * 60, forgetAfterMinutes: 24 * 60 },
  /** Failed sign-ins from one client address over all accounts (looser: an office may share one address). */
  address: { freeFailures: 50, firstDelaySeconds: 60, maxDelaySeconds: 15 * 60, forgetAfterMinutes: 60 },
} as const satisfies Record<string, FailureRule>

/** Throttle counters untouched for this long are deleted (longer than any rule's window or forgetting time). */
export const COUNTERS_KEPT_HOURS = 48

/** Invitations sent in the last hour: by one person (over all labs), and into one lab (by all its owners). */
export const INVITATIONS_PER_HOUR = { perUser: 20, perLab: 20 } as const

/** Password reset mails to one account: at most `perWindow` in `windowMinutes`, so the form cannot flood a mailbox. */
export const RESET_MAILS = { perWindow: 3, windowMinutes: 15 } as const

/** Registrations asked from one client address in an hour (each may mail a stranger's address). */
export const REGISTRATIONS_PER_ADDRESS_PER_HOUR = 10

/** Mails a registration may cause to one address in an hour (confirmation links, "someone tried to register"). */
export const REGISTRATION_MAILS_PER_HOUR = 3

/** Seconds to wait after `hits` failures under `rule` (0 while within the free ones). */
export function failureDelaySeconds(rule: FailureRule, hits: number): number {
  const over = hits - rule.freeFailures
  if (over <= 0) return 0
  return Math.min(rule.maxDelaySeconds, rule.firstDelaySeconds * 2 ** Math.min(over - 1, 30))
}

/** Seconds still to wait at `now` given a counter's hits and last failure (0: go ahead). */
export function failureWaitSeconds(rule: FailureRule, counter: { hits: number, lastAt: Date } | undefined, now: number): number {
  if (!counter) return 0
  const since = now - counter.lastAt.getTime()
  if (since >= rule.forgetAfterMinutes * 60_000) return 0
  return Math.max(0, Math.ceil((failureDelaySeconds(rule, counter.hits) * 1000 - since) / 1000))
}

/** "45 seconds", "1 minute", "15 minutes", "2 hours". */
export function waitInWords(seconds: number): string {
  const plural = (n: number, unit: string) => `${n} ${unit}${n === 1 ? '' : 's'}`
  if (seconds < 90) return plural(Math.max(1, Math.ceil(seconds)), 'second')
  if (seconds < 90 * 60) return plural(Math.ceil(seconds / 60), 'minute')
  return plural(Math.ceil(seconds / 3600), 'hour')
}

const clock = new Intl.DateTimeFormat('en-GB', { timeStyle: 'short', timeZone: 'UTC' })

/** A 429 with Retry-After: `what` says what was refused, and the message ends with when to try again. */
export function refuseForNow(event: H3Event, what: string, seconds: number): never {
  const wait = Math.max(1, Math.ceil(seconds))
  setResponseHeader(event, 'Retry-After', wait)
  const at = clock.format(new Date(Date.now() + wait * 1000))
  throw createError({
    statusCode: 429,
    message: `${what} Try again in ${waitInWords(wait)} (after ${at} UTC).`,
    data: { retryAfterSeconds: wait },
  })
}

/**
 * Requests with an API token that is unknown, revoked or expired, per client
 * address: like sign-in failures, a few are free, then each further one
 * waits longer (a guesser cannot try many secrets; a script with an old
 * token is told to stop).
 */
export const API_TOKEN_THROTTLE: FailureRule = { freeFailures: 10, firstDelaySeconds: 30, maxDelaySeconds: 15 * 60, forgetAfterMinutes: 60 }

/** Live (not revoked, not expired) API tokens one account may hold. */
export const API_TOKENS_PER_USER = 20
