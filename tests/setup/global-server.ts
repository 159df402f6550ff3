/**
 * Global setup of the `nuxt` test project: starts the private MariaDB and
 * Redis when they are down, recreates equipoise_test with the migrations and
 * the demo seed, empties the tests' Redis database,
 * and starts the built server (.output) and one study worker process
 * (dist/worker.mjs, bundled afresh) once for every route and browser test
 * file. Files reach it through `inject('baseURL')` (see server.ts).
 */
import { spawnSync } from 'node:child_process'
import { existsSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { migrateDatabase, openDatabase } from '../../server/database/connect'
import { seedDemo } from '../../server/database/seed'
import { flushTestRedis, recreateTestDatabase, TEST_DATABASE_URL, TEST_REDIS_URL } from './test-database'
import { startPrivateServers } from '../../scripts/private-server.mjs'
import { startFakeSmtp } from '../../scripts/fake-smtp.mjs'
import { BUILT_SERVER_ENTRY, startServerProcess, startWorkerProcess, type ServerProcess, type WorkerProcess } from './server-process'
import { buildWorker } from '../../scripts/build-worker.mjs'

const root = resolve(import.meta.dirname, '../..')

/** A random secret for this run only; sessions from other runs are then invalid. */
const TEST_SESSION_PASSWORD = `test-${Date.now()}-${Math.random().toString(36).slice(2)}-only-for-tests`

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string
    /** The folder where the fake SMTP server keeps this run's mail (see mail.ts). */
    mailDir: string
    /** The environment the built server runs with (without PORT), for a test that starts a second one. */
    serverEnv: Record<string, string>
  }
}

export default async function setup(project: TestProject) {
  startPrivateServers()

  await recreateTestDatabase()
  await flushTestRedis()
  await migrateDatabase(TEST_DATABASE_URL)
  const { db: testDb, pool } = openDatabase(TEST_DATABASE_URL)
  await seedDemo(testDb, resolve(root, 'examples'))
  await pool.end()

  const entry = BUILT_SERVER_ENTRY
  if (!existsSync(entry)) {
    const build = spawnSync(process.execPath, [resolve(root, 'node_modules/nuxt/bin/nuxt.mjs'), 'build'], { cwd: root, stdio: 'inherit' })
    if (build.status !== 0) throw new Error('nuxt build failed (see above)')
  }

  const mail = await startFakeSmtp({ dir: mkdtempSync(resolve(tmpdir(), 'equipoise-test-mail-')) })
  project.provide('mailDir', mail.dir)

  const serverEnv: Record<string, string> = {
    ...process.env as Record<string, string>,
    NODE_ENV: 'production',
    NUXT_DATABASE_URL: TEST_DATABASE_URL,
    EQUIPOISE_REDIS_URL: TEST_REDIS_URL,
    NUXT_SESSION_PASSWORD: TEST_SESSION_PASSWORD,
    NUXT_MAIL_HOST: '127.0.0.1',
    NUXT_MAIL_PORT: String(mail.port),
    NUXT_MAIL_CAPTURE_DIR: mail.dir,
    // Requests from the tests come over loopback; X-Forwarded-For then stands for a client address.
    NUXT_TRUSTED_PROXIES: '127.0.0.1,::1',
    // Not production mode, despite NODE_ENV: the tests sign in with the demo accounts.
    EQUIPOISE_PRODUCTION: '0',
    // NUXT_PUBLIC_SITE_URL, the site origin, is set by startServerProcess to the address it serves.
  }
  // The study worker is bundled afresh, so the tests run the worker code as it is now.
  await buildWorker()
  let server: ServerProcess | undefined
  let worker: WorkerProcess
  try {
    server = await startServerProcess(serverEnv, root)
    worker = await startWorkerProcess(serverEnv, root)
  } catch (error) {
    await server?.stop()
    await mail.close()
    throw error
  }
  const baseURL = server.baseURL
  // A test may start a second process like this one on the same database.
  project.provide('serverEnv', serverEnv)
  project.provide('baseURL', baseURL)

  return async () => {
    await worker.stop()
    await server.stop()
    await mail.close()
    rmSync(mail.dir, { recursive: true, force: true })
  }
}
