// The pure parts of the account limits: sign-in delays, the client address
// behind a trusted proxy, and session lifetimes.
import { describe, expect, it } from 'vitest'
import { COUNTERS_KEPT_HOURS, failureDelaySeconds, failureWaitSeconds, LOGIN_THROTTLE, waitInWords } from '../../../server/utils/limits'
import { clientAddressFrom, trustedProxyList } from '../../../server/utils/client-address'
import { sessionEndMessage, sessionEndReason, sessionLifetimesFrom } from '../../../server/utils/session-lifetime'

const MINUTE = 60_000
const pair = LOGIN_THROTTLE.accountAndAddress

describe('sign-in delays', () => {
  it('lets the free failures pass, then doubles the wait up to the ceiling', () => {
    expect(failureDelaySeconds(pair, pair.freeFailures)).toBe(0)
    expect(failureDelaySeconds(pair, pair.freeFailures + 1)).toBe(pair.firstDelaySeconds)
    expect(failureDelaySeconds(pair, pair.freeFailures + 2)).toBe(pair.firstDelaySeconds * 2)
    expect(failureDelaySeconds(pair, pair.freeFailures + 3)).toBe(pair.firstDelaySeconds * 4)
    expect(failureDelaySeconds(pair, pair.freeFailures + 100)).toBe(pair.maxDelaySeconds)
  })

  it('counts the wait from the last failure and forgets an old counter', () => {
    const t0 = Date.UTC(2026, 0, 1, 12)
    const counter = { hits: pair.freeFailures + 1, lastAt: new Date(t0) }
    expect(failureWaitSeconds(pair, counter, t0)).toBe(pair.firstDelaySeconds)
    expect(failureWaitSeconds(pair, counter, t0 + 10_000)).toBe(pair.firstDelaySeconds - 10)
    expect(failureWaitSeconds(pair, counter, t0 + pair.firstDelaySeconds * 1000)).toBe(0)
    const many = { hits: 1000, lastAt: new Date(t0) }
    expect(failureWaitSeconds(pair, many, t0 + 60_000)).toBe(pair.maxDelaySeconds - 60)
    expect(failureWaitSeconds(pair, many, t0 + pair.forgetAfterMinutes * MINUTE)).toBe(0)
    expect(failureWaitSeconds(pair, undefined, t0)).toBe(0)
  })

  it('keeps every counter at least as long as its rule remembers it', () => {
    for (const rule of Object.values(LOGIN_THROTTLE)) expect(rule.forgetAfterMinutes).toBeLessThanOrEqual(COUNTERS_KEPT_HOURS * 60)
  })

  it('says the wait in words', () => {
    expect(waitInWords(1)).toBe('1 second')
    expect(waitInWords(30)).toBe('30 seconds')
    expect(waitInWords(120)).toBe('2 minutes')
    expect(waitInWords(15 * 60)).toBe('15 minutes')
    expect(waitInWords(3 * 3600)).toBe('3 hours')
  })
})

describe('client address', () => {
  const trusted = trustedProxyList('127.0.0.1, ::1, 10.0.0.0/8')

  it('believes X-Forwarded-For only from a trusted proxy', () => {
    expect(clientAddressFrom('127.0.0.1', '203.0.113.7', trusted)).toBe('203.0.113.7')
    expect(clientAddressFrom('::ffff:127.0.0.1', '203.0.113.7', trusted)).toBe('203.0.113.7')
    expect(clientAddressFrom('198.51.100.2', '203.0.113.7', trusted)).toBe('198.51.100.2')
    expect(clientAddressFrom('127.0.0.1', undefined, trusted)).toBe('127.0.0.1')
  })

  it('takes the rightmost hop that is not a trusted proxy, so a client cannot prepend a forged one', () => {
    expect(clientAddressFrom('127.0.0.1', '1.2.3.4, 203.0.113.7, 10.1.2.3', trusted)).toBe('203.0.113.7')
  })

  it('trusts nobody when the list is empty, and skips entries that are not addresses', () => {
    expect(clientAddressFrom('127.0.0.1', '203.0.113.7', trustedProxyList(''))).toBe('127.0.0.1')
    expect(clientAddressFrom('127.0.0.1', '203.0.113.7', trustedProxyList('proxy.example, 127.0.0.1'))).toBe('203.0.113.7')
  })
})

describe('session lifetimes', () => {
  const lifetimes = { idleMinutes: 60, absoluteMinutes: 24 * 60 }
  const t0 = Date.UTC(2026, 0, 1, 0)

  it('ends a session idle for too long, and any session past its absolute lifetime', () => {
    const fresh = { createdAt: new Date(t0), lastSeenAt: new Date(t0) }
    expect(sessionEndReason(fresh, t0 + 59 * MINUTE, lifetimes)).toBeNull()
    expect(sessionEndReason(fresh, t0 + 60 * MINUTE, lifetimes)).toBe('idle')
    const busy = { createdAt: new Date(t0), lastSeenAt: new Date(t0 + 24 * 60 * MINUTE - MINUTE) }
    expect(sessionEndReason(busy, t0 + 24 * 60 * MINUTE - 1, lifetimes)).toBeNull()
    expect(sessionEndReason(busy, t0 + 24 * 60 * MINUTE, lifetimes)).toBe('absolute')
  })

  it('reads the configuration, falling back to the defaults for missing or bad values', () => {
    expect(sessionLifetimesFrom({ sessionIdleMinutes: '15', sessionAbsoluteMinutes: 120 })).toEqual({ idleMinutes: 15, absoluteMinutes: 120 })
    expect(sessionLifetimesFrom({ sessionIdleMinutes: 0, sessionAbsoluteMinutes: 'x' })).toEqual({ idleMinutes: 7 * 24 * 60, absoluteMinutes: 30 * 24 * 60 })
  })

  it('tells the person why they must sign in again', () => {
    expect(sessionEndMessage('idle', lifetimes)).toBe('You were signed out after 1 hour without activity; sign in again')
    expect(sessionEndMessage('absolute', lifetimes)).toBe('A sign-in lasts 1 day; sign in again')
  })
})
