// Once an hour, deletes what can no longer be used: sessions past their
// lifetimes, throttle counters idle for longer than any rule remembers, and
// registrations whose link expired a day ago. Each is also refused when
// presented; this only keeps the tables small.
import { lt, or } from 'drizzle-orm'

const HOUR_MS = 3600_000

async function sweep(): Promise<void> {
  const db = useDb()
  const now = Date.now()
  const lifetimes = sessionLifetimes()
  await db.delete(tables.sessions).where(or(
    lt(tables.sessions.lastSeenAt, new Date(now - lifetimes.idleMinutes * 60_000)),
    lt(tables.sessions.createdAt, new Date(now - lifetimes.absoluteMinutes * 60_000)),
  ))
  await db.delete(tables.throttleCounters).where(lt(tables.throttleCounters.lastAt, new Date(now - COUNTERS_KEPT_HOURS * HOUR_MS)))
  await db.delete(tables.pendingRegistrations).where(lt(tables.pendingRegistrations.expiresAt, new Date(now - 24 * HOUR_MS)))
}

export default defineNitroPlugin(() => {
  if (import.meta.prerender) return
  const timer = setInterval(() => {
    sweep().catch((error) => console.error('[cleanup] could not delete ended sessions and old counters:', error instanceof Error ? error.message : error))
  }, HOUR_MS)
  timer.unref()
})
