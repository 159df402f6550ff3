/**
 * How long a session lasts (`SessionLifetimes`, shared/types/account.ts).
 * Configured with NUXT_SESSION_IDLE_MINUTES and NUXT_SESSION_ABSOLUTE_MINUTES.
 */
import type { SessionLifetimes } from '../../shared/types/account'

export const DEFAULT_SESSION_LIFETIMES: SessionLifetimes = { idleMinutes: 7 * 24 * 60, absoluteMinutes: 30 * 24 * 60 }

/** The configured lifetimes; a missing or non-positive value falls back to the default. */
export function sessionLifetimesFrom(config: { sessionIdleMinutes?: unknown, sessionAbsoluteMinutes?: unknown }): SessionLifetimes {
  const pick = (value: unknown, fallback: number) => {
    const n = Number(value)
    return Number.isFinite(n) && n > 0 ? n : fallback
  }
  return {
    idleMinutes: pick(config.sessionIdleMinutes, DEFAULT_SESSION_LIFETIMES.idleMinutes),
    absoluteMinutes: pick(config.sessionAbsoluteMinutes, DEFAULT_SESSION_LIFETIMES.absoluteMinutes),
  }
}

/** Why a session has ended at `now`, or null while it is alive. */
export function sessionEndReason(session: { createdAt: Date, lastSeenAt: Date }, now: number, lifetimes: SessionLifetimes): 'absolute' | 'idle' | null {
  if (now - session.createdAt.getTime() >= lifetimes.absoluteMinutes * 60_000) return 'absolute'
  if (now - session.lastSeenAt.getTime() >= lifetimes.idleMinutes * 60_000) return 'idle'
  return null
}

function duration(minutes: number): string {
  if (minutes % (24 * 60) === 0) return `${minutes / (24 * 60)} day${minutes === 24 * 60 ? '' : 's'}`
  if (minutes % 60 === 0) return `${minutes / 60} hour${minutes === 60 ? '' : 's'}`
  return `${minutes} minute${minutes === 1 ? '' : 's'}`
}

/** What the person is told when their session has ended for that reason. */
export function sessionEndMessage(reason: 'absolute' | 'idle', lifetimes: SessionLifetimes): string {
  return reason === 'idle'
    ? `You were signed out after ${duration(lifetimes.idleMinutes)} without activity; sign in again`
    : `A sign-in lasts ${duration(lifetimes.absoluteMinutes)}; sign in again`
}
