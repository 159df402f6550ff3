// The built server's own start-up rule: without a session secret it must not
// run (nuxt-auth-utils would only warn, and every sign-in would then fail).
import { spawnSync } from 'node:child_process'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { TEST_DATABASE_URL } from '../setup/test-database'

const entry = resolve(import.meta.dirname, '../../.output/server/index.mjs')

function startWith(sessionPassword: string | undefined) {
  const env: Record<string, string> = { ...process.env as Record<string, string>, NODE_ENV: 'production', PORT: '0', NUXT_DATABASE_URL: TEST_DATABASE_URL }
  delete env.NUXT_SESSION_PASSWORD
  if (sessionPassword !== undefined) env.NUXT_SESSION_PASSWORD = sessionPassword
  return spawnSync(process.execPath, [entry], { env, encoding: 'utf8', timeout: 20_000 })
}

describe('starting the built server', () => {
  it('refuses to start without NUXT_SESSION_PASSWORD and says what to set', () => {
    const run = startWith(undefined)
    expect(run.status).toBe(1)
    expect(run.stderr).toContain('set NUXT_SESSION_PASSWORD')
  })

  it('refuses a session password shorter than 32 characters', () => {
    const run = startWith('too-short')
    expect(run.status).toBe(1)
    expect(run.stderr).toContain('at least 32 characters')
  })
})
