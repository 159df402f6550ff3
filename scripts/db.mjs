#!/usr/bin/env node
// A private MariaDB for this checkout: data under .data/mariadb, socket and
// pid under .data/run, TCP on 127.0.0.1:3307 only. It never touches the
// system instance (/etc/mysql, port 3306) because every call passes
// --no-defaults. Usage: node scripts/db.mjs start|stop|status
import { spawn, spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, openSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { alive, ensureInstalled, portTaken, readPid as readPidFile, sleep, waitUntil } from './private-server.mjs'

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..')
const dataRoot = join(root, '.data')
const dataDir = join(dataRoot, 'mariadb')
const runDir = join(dataRoot, 'run')
const socket = join(runDir, 'mysqld.sock')
const pidFile = join(runDir, 'mysqld.pid')
const errorLog = join(dataRoot, 'mysqld.err')
// EQUIPOISE_DB_PORT lets a second checkout (a CI check beside a working copy) run its own instance.
const port = Number(process.env.EQUIPOISE_DB_PORT || 3307)
const appUser = 'equipoise'
const appPassword = 'equipoise'
const databases = ['equipoise', 'equipoise_test']

const readPid = () => readPidFile(pidFile)

function ping() {
  return spawnSync('mariadb-admin', ['--no-defaults', `--socket=${socket}`, '-uroot', 'ping'], { stdio: 'ignore' }).status === 0
}

function rootSql(sql) {
  const r = spawnSync('mariadb', ['--no-defaults', `--socket=${socket}`, '-uroot', '-e', sql], { encoding: 'utf8' })
  if (r.status !== 0) throw new Error(`SQL failed: ${r.stderr.trim()}`)
}

function initialise() {
  if (existsSync(join(dataDir, 'mysql'))) return
  mkdirSync(dataDir, { recursive: true })
  console.log('Initialising a private MariaDB in .data/mariadb …')
  const r = spawnSync('mariadb-install-db', [
    '--no-defaults', `--datadir=${dataDir}`, '--user=root',
    '--auth-root-authentication-method=socket', '--skip-test-db',
  ], { encoding: 'utf8' })
  if (r.status !== 0) {
    console.error(r.stdout, r.stderr)
    process.exit(1)
  }
}

/** The largest statement the server takes: a stored run's answer (a long sweep or a map) is tens of megabytes of JSON. */
const MAX_ALLOWED_PACKET = 256 * 1024 * 1024

function provision() {
  const statements = [
    // Also for a server started before this setting was passed at start-up (new connections see it).
    `SET GLOBAL max_allowed_packet = ${MAX_ALLOWED_PACKET}`,
    `CREATE USER IF NOT EXISTS '${appUser}'@'127.0.0.1' IDENTIFIED BY '${appPassword}'`,
    `CREATE USER IF NOT EXISTS '${appUser}'@'localhost' IDENTIFIED BY '${appPassword}'`,
  ]
  for (const db of databases) {
    statements.push(`CREATE DATABASE IF NOT EXISTS \`${db}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`)
    statements.push(`GRANT ALL PRIVILEGES ON \`${db}\`.* TO '${appUser}'@'127.0.0.1'`)
    statements.push(`GRANT ALL PRIVILEGES ON \`${db}\`.* TO '${appUser}'@'localhost'`)
  }
  // Any equipoise_test* database, so a second checkout can test beside this one (EQUIPOISE_TEST_DB).
  statements.push(`GRANT ALL PRIVILEGES ON \`equipoise\\_test%\`.* TO '${appUser}'@'127.0.0.1'`)
  statements.push(`GRANT ALL PRIVILEGES ON \`equipoise\\_test%\`.* TO '${appUser}'@'localhost'`)
  rootSql(statements.join(';\n'))
}

async function start() {
  const mariadbd = ensureInstalled('mariadbd', 'mariadb-server')
  mkdirSync(runDir, { recursive: true })
  if (alive(readPid()) && ping()) {
    provision()
    console.log(`MariaDB already running on 127.0.0.1:${port}`)
    return
  }
  if (await portTaken(port)) {
    console.error(`Port ${port} on 127.0.0.1 is in use by another program (another checkout's database?).\n`
      + `Stop it, or run this checkout on another port: EQUIPOISE_DB_PORT=3317 npm start`)
    process.exit(1)
  }
  initialise()
  const log = openSync(errorLog, 'a')
  const child = spawn(mariadbd, [
    '--no-defaults', '--user=root', `--datadir=${dataDir}`, `--socket=${socket}`,
    `--pid-file=${pidFile}`, `--port=${port}`, '--bind-address=127.0.0.1',
    '--skip-name-resolve', `--log-error=${errorLog}`, '--innodb-buffer-pool-size=64M',
    '--character-set-server=utf8mb4', '--collation-server=utf8mb4_unicode_ci',
    `--max-allowed-packet=${MAX_ALLOWED_PACKET}`,
  ], { detached: true, stdio: ['ignore', log, log] })
  child.unref()
  if (!await waitUntil(ping, () => child.exitCode !== null)) {
    console.error(`MariaDB did not start; see ${errorLog}`)
    process.exit(1)
  }
  provision()
  console.log(`MariaDB running on 127.0.0.1:${port} (data in .data/mariadb)`)
}

async function stop() {
  const pid = readPid()
  if (!alive(pid)) {
    console.log('MariaDB is not running')
    return
  }
  spawnSync('mariadb-admin', ['--no-defaults', `--socket=${socket}`, '-uroot', 'shutdown'], { stdio: 'inherit' })
  const deadline = Date.now() + 30_000
  while (alive(pid) && Date.now() < deadline) await sleep(100)
  console.log(alive(pid) ? `MariaDB (pid ${pid}) is still stopping` : 'MariaDB stopped')
}

function status() {
  const pid = readPid()
  if (alive(pid) && ping()) {
    console.log(`MariaDB running (pid ${pid}) on 127.0.0.1:${port}`)
  } else {
    console.log('MariaDB is not running')
    process.exitCode = 3
  }
}

const command = process.argv[2]
if (command === 'start') await start()
else if (command === 'stop') await stop()
else if (command === 'status') status()
else {
  console.error('Usage: node scripts/db.mjs start|stop|status')
  process.exit(2)
}
