import { describe, expect, it } from 'vitest'
import { clearLoginFailures, loginRetryAfterSeconds, recordLoginFailure } from '../../../server/utils/login-throttle'

const MINUTE = 60_000

describe('sign-in throttle', () => {
  it('allows four failures for one account and blocks the fifth for the rest of the 15-minute window', () => {
    const t0 = 1_000_000_000
    for (let i = 0; i < 4; i++) recordLoginFailure('a@lab.test', '10.0.0.1', t0 + i * MINUTE)
    expect(loginRetryAfterSeconds('a@lab.test', '10.0.0.1', t0 + 4 * MINUTE)).toBe(0)
    recordLoginFailure('a@lab.test', '10.0.0.1', t0 + 4 * MINUTE)
    // The first failure stops counting at t0 + 15 min: 10 minutes after the check.
    expect(loginRetryAfterSeconds('a@lab.test', '10.0.0.1', t0 + 5 * MINUTE)).toBe(600)
    expect(loginRetryAfterSeconds('a@lab.test', '10.0.0.1', t0 + 15 * MINUTE)).toBe(0)
  })

  it('does not block another account from the same place for one account’s failures', () => {
    const t0 = 2_000_000_000
    for (let i = 0; i < 5; i++) recordLoginFailure('b@lab.test', '10.0.0.2', t0)
    expect(loginRetryAfterSeconds('b@lab.test', '10.0.0.2', t0)).toBeGreaterThan(0)
    expect(loginRetryAfterSeconds('c@lab.test', '10.0.0.2', t0)).toBe(0)
  })

  it('blocks one network address trying many accounts', () => {
    const t0 = 3_000_000_000
    for (let i = 0; i < 30; i++) recordLoginFailure(`user${i}@lab.test`, '10.0.0.3', t0)
    expect(loginRetryAfterSeconds('fresh@lab.test', '10.0.0.3', t0)).toBeGreaterThan(0)
    expect(loginRetryAfterSeconds('fresh@lab.test', '10.0.0.4', t0)).toBe(0)
  })

  it('forgets an account’s failures after a successful sign-in', () => {
    const t0 = 4_000_000_000
    for (let i = 0; i < 5; i++) recordLoginFailure('d@lab.test', '10.0.0.5', t0)
    clearLoginFailures('d@lab.test')
    expect(loginRetryAfterSeconds('d@lab.test', '10.0.0.6', t0)).toBe(0)
  })
})
