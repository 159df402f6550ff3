#!/usr/bin/env node
// A private Redis for this checkout's job queue, beside the private MariaDB
// (scripts/db.mjs): data under .data/redis, pid under .data/run, TCP on
// 127.0.0.1 only, port EQUIPOISE_REDIS_PORT (scripts/redis-url.mjs). It reads
// no system configuration (/etc/redis). Usage: node scripts/redis.mjs start|stop|status
import { spawn, spawnSync } from 'node:child_process'
import { mkdirSync, openSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { alive, ensureInstalled, portTaken, readPid as readPidFile, sleep, waitUntil } from './private-server.mjs'
import { redisPort } from './redis-url.mjs'

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..')
const dataRoot = join(root, '.data')
const dataDir = join(dataRoot, 'redis')
const runDir = join(dataRoot, 'run')
const pidFile = join(runDir, 'redis.pid')
const logFile = join(dataRoot, 'redis.log')
const port = redisPort()

const readPid = () => readPidFile(pidFile)

function cli(...args) {
  return spawnSync('redis-cli', ['-h', '127.0.0.1', '-p', String(port), ...args], { encoding: 'utf8' })
}

function ping() {
  const r = cli('ping')
  return r.status === 0 && r.stdout.trim() === 'PONG'
}

async function start() {
  const redisServer = ensureInstalled('redis-server', 'redis-server')
  mkdirSync(runDir, { recursive: true })
  mkdirSync(dataDir, { recursive: true })
  if (alive(readPid()) && ping()) {
    console.log(`Redis already running on 127.0.0.1:${port}`)
    return
  }
  if (await portTaken(port)) {
    console.error(`Port ${port} on 127.0.0.1 is in use by another program (another checkout's Redis?).\n`
      + `Stop it, or run this checkout on another port: EQUIPOISE_REDIS_PORT=6390 npm start`)
    process.exit(1)
  }
  const log = openSync(logFile, 'a')
  // The queue must not lose jobs: an append-only file, and no eviction under memory pressure (BullMQ needs both).
  const child = spawn(redisServer, [
    '--port', String(port), '--bind', '127.0.0.1', '--protected-mode', 'yes',
    '--dir', dataDir, '--pidfile', pidFile, '--daemonize', 'no', '--logfile', '',
    '--appendonly', 'yes', '--maxmemory-policy', 'noeviction',
  ], { detached: true, stdio: ['ignore', log, log] })
  child.unref()
  if (!await waitUntil(ping, () => child.exitCode !== null)) {
    console.error(`Redis did not start; see ${logFile}`)
    process.exit(1)
  }
  console.log(`Redis running on 127.0.0.1:${port} (data in .data/redis)`)
}

async function stop() {
  const pid = readPid()
  if (!alive(pid)) {
    console.log('Redis is not running')
    return
  }
  cli('shutdown')
  const deadline = Date.now() + 30_000
  while (alive(pid) && Date.now() < deadline) await sleep(100)
  console.log(alive(pid) ? `Redis (pid ${pid}) is still stopping` : 'Redis stopped')
}

function status() {
  const pid = readPid()
  if (alive(pid) && ping()) {
    console.log(`Redis running (pid ${pid}) on 127.0.0.1:${port}`)
  } else {
    console.log('Redis is not running')
    process.exitCode = 3
  }
}

const command = process.argv[2]
if (command === 'start') await start()
else if (command === 'stop') await stop()
else if (command === 'status') status()
else {
  console.error('Usage: node scripts/redis.mjs start|stop|status')
  process.exit(2)
}
