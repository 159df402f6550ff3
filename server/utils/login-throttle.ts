/**
 * Slows down password guessing: after too many failed sign-ins for one
 * e-mail address, or from one network address, within a window, sign-in
 * answers 429 with the seconds to wait. Kept in memory: one server process
 * serves a lab, and a restart forgetting the count is harmless.
 */
const WINDOW_MS = 15 * 60 * 1000
const LIMITS = { account: 5, network: 30 } as const

const failures = new Map<string, number[]>()

function recent(key: string, now: number): number[] {
  const kept = (failures.get(key) ?? []).filter((t) => now - t < WINDOW_MS)
  if (kept.length) failures.set(key, kept)
  else failures.delete(key)
  return kept
}

function keys(email: string, ip: string) {
  return [
    { key: `account:${email}`, limit: LIMITS.account },
    { key: `network:${ip}`, limit: LIMITS.network },
  ]
}

/** Seconds to wait before another attempt is allowed, or 0 when it is allowed now. */
export function loginRetryAfterSeconds(email: string, ip: string, now = Date.now()): number {
  let wait = 0
  for (const { key, limit } of keys(email, ip)) {
    const times = recent(key, now)
    if (times.length >= limit) {
      const oldestThatCounts = times[times.length - limit]!
      wait = Math.max(wait, Math.ceil((oldestThatCounts + WINDOW_MS - now) / 1000))
    }
  }
  return wait
}

export function recordLoginFailure(email: string, ip: string, now = Date.now()): void {
  for (const { key } of keys(email, ip)) failures.set(key, [...recent(key, now), now])
}

export function clearLoginFailures(email: string): void {
  failures.delete(`account:${email}`)
}
