/**
 * Hit counters in MariaDB (throttle_counters), for limits that must survive a
 * restart and hold across server processes. A counter starts over either when
 * it has had no hit for `minutes` ('idle') or when its first hit is `minutes`
 * old ('window').
 */
import { inArray, sql } from 'drizzle-orm'
import type { ThrottleCounter } from '../database/schema'
import { tables, useDb } from './db'

/** A DATETIME(3) literal in UTC, as Drizzle writes its date columns. */
function utcDatetime(date: Date): string {
  return date.toISOString().replace('T', ' ').replace('Z', '')
}

/** Adds one hit to the counter (starting it over when due) and returns its hits after that. */
export async function bumpCounter(key: string, minutes: number, resetWhen: 'idle' | 'window', now = new Date()): Promise<number> {
  const db = useDb()
  const at = utcDatetime(now)
  const cutoff = utcDatetime(new Date(now.getTime() - minutes * 60_000))
  const stale = resetWhen === 'idle' ? sql`last_at < ${cutoff}` : sql`first_at < ${cutoff}`
  // MariaDB applies the assignments left to right: first_at and last_at are set after the tests that read them.
  await db.execute(sql`
    INSERT INTO throttle_counters (\`key\`, hits, first_at, last_at) VALUES (${key}, 1, ${at}, ${at})
    ON DUPLICATE KEY UPDATE
      hits = IF(${stale}, 1, hits + 1),
      first_at = IF(${stale}, VALUES(first_at), first_at),
      last_at = VALUES(last_at)`)
  const [row] = await readCounters([key])
  return row?.hits ?? 1
}

export async function readCounters(keys: string[]): Promise<ThrottleCounter[]> {
  if (!keys.length) return []
  return useDb().select().from(tables.throttleCounters).where(inArray(tables.throttleCounters.key, keys))
}

export async function deleteCounter(key: string): Promise<void> {
  await useDb().delete(tables.throttleCounters).where(inArray(tables.throttleCounters.key, [key]))
}
