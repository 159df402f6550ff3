/**
 * What the command line keeps between calls, in the user's configuration
 * folder ($XDG_CONFIG_HOME/equipoise, ~/.config/equipoise, or
 * %APPDATA%\equipoise on Windows; EQUIPOISE_CONFIG_DIR overrides):
 * `login.json` (server and token, mode 600) and `pulled.json` (which
 * revision each pulled file came from, so `push` knows its base).
 */
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { homedir } from 'node:os'
import { join, resolve } from 'node:path'
import { CliError, EXIT } from './exit-codes'

export function configDir(): string {
  const env = process.env
  if (env.EQUIPOISE_CONFIG_DIR) return env.EQUIPOISE_CONFIG_DIR
  if (process.platform === 'win32' && env.APPDATA) return join(env.APPDATA, 'equipoise')
  return join(env.XDG_CONFIG_HOME || join(homedir(), '.config'), 'equipoise')
}

function readJson<T>(name: string, fallback: T): T {
  const file = join(configDir(), name)
  if (!existsSync(file)) return fallback
  try {
    return JSON.parse(readFileSync(file, 'utf8')) as T
  } catch {
    throw new CliError(EXIT.failed, `${file} is not valid JSON; delete it and run the command again`)
  }
}

/** Writes a private file (mode 600 in a folder of mode 700), also when it existed with wider rights. */
function writePrivateJson(name: string, value: unknown): string {
  const dir = configDir()
  mkdirSync(dir, { recursive: true, mode: 0o700 })
  const file = join(dir, name)
  writeFileSync(file, `${JSON.stringify(value, null, 2)}\n`, { mode: 0o600 })
  chmodSync(file, 0o600)
  return file
}

export interface Login {
  server: string
  token: string
}

export function readLogin(): Partial<Login> {
  return readJson<Partial<Login>>('login.json', {})
}

export function saveLogin(login: Login): string {
  return writePrivateJson('login.json', login)
}

/** The server and token to use: EQUIPOISE_SERVER / EQUIPOISE_TOKEN override the stored login. */
export function currentLogin(): Login {
  const stored = readLogin()
  const server = process.env.EQUIPOISE_SERVER || stored.server
  const token = process.env.EQUIPOISE_TOKEN || stored.token
  if (!server || !token) {
    throw new CliError(EXIT.notAllowed, 'Not logged in: make an API token on the settings page, then run `equipoise login --server URL` (or set EQUIPOISE_SERVER and EQUIPOISE_TOKEN)')
  }
  return { server, token }
}

interface Pulled {
  server: string
  target: string
  revision: number
}

/** Remembers that `file` holds revision `revision` of `target` (LAB/SYSTEM) on `server`. */
export function rememberPull(file: string, entry: Pulled): void {
  const all = readJson<Record<string, Pulled>>('pulled.json', {})
  all[resolve(file)] = entry
  writePrivateJson('pulled.json', all)
}

/** The revision `file` was pulled (or last pushed) as, when it was of this target on this server. */
export function pulledRevision(file: string, server: string, target: string): number | undefined {
  const entry = readJson<Record<string, Pulled>>('pulled.json', {})[resolve(file)]
  return entry && entry.server === server && entry.target === target ? entry.revision : undefined
}
