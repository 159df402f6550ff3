/**
 * Global setup of the `nuxt` test project: starts the private MariaDB when it
 * is down, recreates equipoise_test with the migrations and the demo seed,
 * and starts the built server (.output) once for every route and browser
 * test file. Files reach it through `inject('baseURL')` (see server.ts).
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { existsSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { freePort } from '../../scripts/free-port'
import { resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { migrateDatabase, openDatabase } from '../../server/database/connect'
import { seedDemo } from '../../server/database/seed'
import { recreateTestDatabase, TEST_DATABASE_URL } from './test-database'
import { startFakeSmtp } from '../../scripts/fake-smtp.mjs'

const root = resolve(import.meta.dirname, '../..')

/** A random secret for this run only; sessions from other runs are then invalid. */
const TEST_SESSION_PASSWORD = `test-${Date.now()}-${Math.random().toString(36).slice(2)}-only-for-tests`

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string
    /** The folder where the fake SMTP server keeps this run's mail (see mail.ts). */
    mailDir: string
  }
}

async function waitUntilServing(url: string, child: ChildProcess, log: string[]): Promise<void> {
  const deadline = Date.now() + 60_000
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The built server exited (${child.exitCode}):\n${log.join('')}`)
    try {
      const answer = await fetch(url)
      if (answer.ok) return
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`The built server did not answer at ${url}:\n${log.join('')}`)
}

export default async function setup(project: TestProject) {
  const db = spawnSync(process.execPath, [resolve(root, 'scripts/db.mjs'), 'start'], { stdio: 'inherit' })
  if (db.status !== 0) throw new Error('Could not start the private MariaDB (see above)')

  await recreateTestDatabase()
  await migrateDatabase(TEST_DATABASE_URL)
  const { db: testDb, pool } = openDatabase(TEST_DATABASE_URL)
  await seedDemo(testDb, resolve(root, 'examples'))
  await pool.end()

  const entry = resolve(root, '.output/server/index.mjs')
  if (!existsSync(entry)) {
    const build = spawnSync(process.execPath, [resolve(root, 'node_modules/nuxt/bin/nuxt.mjs'), 'build'], { cwd: root, stdio: 'inherit' })
    if (build.status !== 0) throw new Error('nuxt build failed (see above)')
  }

  const mail = await startFakeSmtp({ dir: mkdtempSync(resolve(tmpdir(), 'equipoise-test-mail-')) })
  project.provide('mailDir', mail.dir)

  const port = await freePort()
  const log: string[] = []
  const server = spawn(process.execPath, [entry], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: 'production',
      PORT: String(port),
      NUXT_DATABASE_URL: TEST_DATABASE_URL,
      NUXT_SESSION_PASSWORD: TEST_SESSION_PASSWORD,
      NUXT_MAIL_HOST: '127.0.0.1',
      NUXT_MAIL_PORT: String(mail.port),
      NUXT_MAIL_CAPTURE_DIR: mail.dir,
      // Requests from the tests come over loopback; X-Forwarded-For then stands for a client address.
      NUXT_TRUSTED_PROXIES: '127.0.0.1,::1',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  server.stdout?.on('data', (chunk) => log.push(String(chunk)))
  server.stderr?.on('data', (chunk) => log.push(String(chunk)))
  // localhost, not 127.0.0.1: Chromium keeps the Secure session cookie for localhost over plain http.
  const baseURL = `http://localhost:${port}/`
  try {
    await waitUntilServing(baseURL, server, log)
  } catch (error) {
    server.kill()
    await mail.close()
    throw error
  }
  project.provide('baseURL', baseURL)

  return async () => {
    server.kill()
    await new Promise((r) => (server.exitCode !== null ? r(null) : server.once('exit', r)))
    await mail.close()
    rmSync(mail.dir, { recursive: true, force: true })
  }
}
