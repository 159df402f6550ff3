// What the private servers of a checkout (scripts/db.mjs: MariaDB,
// scripts/redis.mjs: Redis) share: installing Debian's package when it is
// missing, the pid file, and whether a port on 127.0.0.1 is already taken.
import { spawnSync } from 'node:child_process'
import { existsSync, readFileSync } from 'node:fs'
import { createConnection } from 'node:net'

export const sleep = (ms) => new Promise((r) => setTimeout(r, ms))

function which(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { encoding: 'utf8' }).status === 0
}

/** The path of `binary` (on PATH or in /usr/sbin, /usr/bin), installing Debian's `pkg` with apt-get as root when it is missing. */
export function ensureInstalled(binary, pkg) {
  const known = () => ['/usr/sbin', '/usr/bin'].map((dir) => `${dir}/${binary}`).find((path) => existsSync(path))
    ?? (which(binary) ? binary : null)
  const found = known()
  if (found) return found
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0
  if (!isRoot) {
    console.error(`${pkg} is not installed. Install it once with:\n\n  sudo apt-get update && sudo apt-get install -y ${pkg}\n`)
    process.exit(1)
  }
  console.log(`Installing ${pkg} with apt-get …`)
  for (const args of [['update'], ['install', '-y', pkg]]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } })
    if (r.status !== 0) {
      console.error(`apt-get ${args.join(' ')} failed; install ${pkg} by hand and run again.`)
      process.exit(1)
    }
  }
  return known() ?? binary
}

export function readPid(pidFile) {
  try {
    return Number(readFileSync(pidFile, 'utf8').trim()) || null
  } catch {
    return null
  }
}

export function alive(pid) {
  if (!pid) return false
  try {
    process.kill(pid, 0)
    return true
  } catch {
    return false
  }
}

/** True when something already listens on 127.0.0.1:port (another checkout's server, say). */
export function portTaken(port) {
  return new Promise((done) => {
    const socket = createConnection({ host: '127.0.0.1', port })
    socket.once('connect', () => { socket.destroy(); done(true) })
    socket.once('error', () => done(false))
  })
}

/** Waits until `ready()` holds; false when `deadlineMs` passes or `exited()` says the server gave up. */
export async function waitUntil(ready, exited, deadlineMs = 30_000) {
  const deadline = Date.now() + deadlineMs
  while (!ready()) {
    if (Date.now() > deadline || exited()) return false
    await sleep(100)
  }
  return true
}

const scriptsDir = new URL('.', import.meta.url)

/**
 * Starts the checkout's private MariaDB and Redis when they are down (for the
 * tests' global setup and the benchmarks); throws saying which did not start.
 */
export function startPrivateServers({ quiet = false } = {}) {
  for (const [script, what] of [['db.mjs', 'MariaDB'], ['redis.mjs', 'Redis']]) {
    const r = spawnSync(process.execPath, [new URL(script, scriptsDir).pathname, 'start'], { stdio: quiet ? 'ignore' : 'inherit' })
    if (r.status !== 0) throw new Error(`Could not start the private ${what} (run \`node scripts/${script} start\` to see why).`)
  }
}
