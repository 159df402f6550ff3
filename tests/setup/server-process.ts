/**
 * Starting the built server (.output) as a child process and waiting until it
 * answers: once by the global setup for every test file, and again by a test
 * that needs a second process on the same database (see sessions.test.ts).
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { resolve } from 'node:path'
import { freePort } from '../../scripts/free-port'

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
