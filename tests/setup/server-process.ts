/**
 * Starting the built server (.output) as a child process and waiting until it
 * answers: once by the global setup for every test file, and again by a test
 * that needs a second process on the same database (see sessions.test.ts).
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { resolve } from 'node:path'
import { freePort } from '../../scripts/free-port'
import { WORKER_BUNDLE } from '../../scripts/build-worker.mjs'

export const BUILT_SERVER_ENTRY = resolve(import.meta.dirname, '../../.output/server/index.mjs')

export interface ServerProcess {
  /** http://localhost:PORT/ */
  baseURL: string
  child: ChildProcess
  stop(): Promise<void>
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

/**
 * Starts the built server with this environment plus a free PORT and, as the
 * site origin (links in mail, the same-origin check of writes), the address
 * it serves; resolves once it answers.
 */
export async function startServerProcess(env: Record<string, string | undefined>, cwd: string): Promise<ServerProcess> {
  const port = await freePort()
  const log: string[] = []
  const child = spawn(process.execPath, [BUILT_SERVER_ENTRY], {
    cwd,
    env: { ...env, PORT: String(port), NUXT_PUBLIC_SITE_URL: `http://localhost:${port}` },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  child.stdout?.on('data', (chunk) => log.push(String(chunk)))
  child.stderr?.on('data', (chunk) => log.push(String(chunk)))
  const stop = async () => {
    child.kill()
    await new Promise((r) => (child.exitCode !== null ? r(null) : child.once('exit', r)))
  }
  // localhost, not 127.0.0.1: Chromium keeps the Secure session cookie for localhost over plain http.
  const baseURL = `http://localhost:${port}/`
  try {
    await waitUntilServing(baseURL, child, log)
  } catch (error) {
    await stop()
    throw error
  }
  return { baseURL, child, stop }
}

export interface WorkerProcess {
  /** The supervisor; its worker processes are its children. */
  child: ChildProcess
  stop(): Promise<void>
}

/**
 * Starts the study worker (dist/worker.mjs) with `concurrency` worker
 * processes on this environment (its NUXT_DATABASE_URL and
 * EQUIPOISE_REDIS_URL); resolves once each waits for jobs.
 */
export async function startWorkerProcess(env: Record<string, string | undefined>, cwd: string, concurrency = 1): Promise<WorkerProcess> {
  const log: string[] = []
  const child = spawn(process.execPath, [WORKER_BUNDLE, '--concurrency', String(concurrency)], { cwd, env, stdio: ['ignore', 'pipe', 'pipe'] })
  let ready = 0
  const started = new Promise<void>((resolve, reject) => {
    const read = (chunk: Buffer) => {
      log.push(String(chunk))
      ready += (String(chunk).match(/waiting for jobs/g) ?? []).length
      if (ready >= concurrency) resolve()
    }
    child.stdout?.on('data', read)
    child.stderr?.on('data', (chunk) => log.push(String(chunk)))
    child.once('exit', (code) => reject(new Error(`The study worker exited (${code}):\n${log.join('')}`)))
  })
  const stop = async () => {
    if (child.exitCode !== null) return
    child.kill('SIGTERM')
    await new Promise((r) => child.once('exit', r))
  }
  const timeout = new Promise<never>((_, reject) => setTimeout(() => reject(new Error(`The study worker did not start:\n${log.join('')}`)), 30_000).unref())
  try {
    await Promise.race([started, timeout])
  } catch (error) {
    await stop()
    throw error
  }
  return { child, stop }
}
