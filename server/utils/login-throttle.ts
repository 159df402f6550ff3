/**
 * Slows down password guessing without letting anyone lock an account:
 * failures are counted per account and client address (growing delays after
 * a few) and per client address (a looser limit), in MariaDB. The owner
 * signing in from another address is not slowed by a guesser elsewhere.
 * The rules are in limits.ts.
 */
import { createHash } from 'node:crypto'
import { failureWaitSeconds, LOGIN_THROTTLE, type FailureRule } from './limits'
import { bumpCounter, deleteCounter, readCounters } from './throttle-counters'

function counterKeys(email: string, address: string): { key: string, rule: FailureRule }[] {
  const pair = createHash('sha256').update(`${email.toLowerCase()}\n${address}`).digest('hex')
  return [
    { key: `login:account-address:${pair}`, rule: LOGIN_THROTTLE.accountAndAddress },
    { key: `login:address:${address}`.slice(0, 320), rule: LOGIN_THROTTLE.address },
  ]
}

/** Seconds before this account may try again from this address (0: now). */
export async function loginRetryAfterSeconds(email: string, address: string, now = Date.now()): Promise<number> {
  const keys = counterKeys(email, address)
  const rows = await readCounters(keys.map((k) => k.key))
  let wait = 0
  for (const { key, rule } of keys) {
    wait = Math.max(wait, failureWaitSeconds(rule, rows.find((r) => r.key === key), now))
  }
  return wait
}

/** Counts a failed sign-in; a counter with no failure for its rule's forgetting time starts over. */
export async function recordLoginFailure(email: string, address: string): Promise<void> {
  for (const { key, rule } of counterKeys(email, address)) await bumpCounter(key, rule.forgetAfterMinutes, 'idle')
}

/** A successful sign-in clears its account-and-address counter (not the address's). */
export async function clearLoginFailures(email: string, address: string): Promise<void> {
  await deleteCounter(counterKeys(email, address)[0]!.key)
}
