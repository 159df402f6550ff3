/**
 * Talking to an Equipoise server with an API token (Authorization: Bearer;
 * never in a URL). Every failure becomes a CliError with the server's own
 * message and the exit code that fits it.
 */
import { CliError, EXIT, type ExitCode } from './exit-codes'
import type { Login } from './config'

export interface ApiError {
  status: number
  message: string
  data?: Record<string, unknown>
}

/** The exit code for an HTTP error status. */
export function exitCodeFor(status: number): ExitCode {
  if (status === 401 || status === 403) return EXIT.notAllowed
  if (status === 409) return EXIT.conflict
  if (status === 400 || status === 404 || status === 413 || status === 415 || status === 422) return EXIT.badInput
  return EXIT.failed
}

/** The server's address without a trailing slash; a clear error for anything but http(s). */
export function normaliseServer(text: string): string {
  let url: URL
  try {
    url = new URL(text)
  } catch {
    throw new CliError(EXIT.badInput, `"${text}" is not a server address; give one such as https://equipoise.example.org`)
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') {
    throw new CliError(EXIT.badInput, `The server address must start with https:// (or http:// for a local server), not ${url.protocol}`)
  }
  return url.origin + url.pathname.replace(/\/+$/, '')
}

export class Client {
  readonly server: string
  private readonly token: string

  constructor(login: Login) {
    this.server = normaliseServer(login.server)
    this.token = login.token
  }

  /** Sends one request; resolves the JSON answer, or rejects with the API error (`onError` may turn it into a CliError of its own). */
  async request<T>(method: string, path: string, body?: unknown, onError?: (error: ApiError) => CliError | undefined): Promise<T> {
    let response: Response
    try {
      response = await fetch(this.server + path, {
        method,
        headers: {
          accept: 'application/json',
          authorization: `Bearer ${this.token}`,
          ...(body === undefined ? {} : { 'content-type': 'application/json' }),
        },
        body: body === undefined ? undefined : JSON.stringify(body),
        redirect: 'error',
      })
    } catch (error) {
      const cause = (error as { cause?: { code?: string, message?: string } }).cause
      throw new CliError(EXIT.failed, `Could not reach ${this.server} (${cause?.code ?? cause?.message ?? (error as Error).message}); check the address and your connection`)
    }
    const text = await response.text()
    let json: unknown
    try {
      json = text ? JSON.parse(text) : null
    } catch {
      throw new CliError(EXIT.failed, `${this.server} answered ${response.status} with something other than JSON; is this an Equipoise server?`)
    }
    if (response.ok) return json as T
    const payload = (json ?? {}) as { message?: string, data?: Record<string, unknown> }
    const error: ApiError = { status: response.status, message: payload.message || response.statusText || `HTTP ${response.status}`, data: payload.data }
    const own = onError?.(error)
    if (own) throw own
    const retry = response.headers.get('retry-after')
    throw new CliError(exitCodeFor(error.status), error.message + (response.status === 429 && retry && !/Try again/.test(error.message) ? ` (try again in ${retry} s)` : ''))
  }

  get<T>(path: string): Promise<T> {
    return this.request<T>('GET', path)
  }
}

/** `LAB/SYSTEM` split into its slugs, with a clear error otherwise. */
export function parseTarget(text: string | undefined): { lab: string, system: string, path: string } {
  const match = /^([^/\s]+)\/([^/\s]+)$/.exec(text ?? '')
  if (!match) throw new CliError(EXIT.badInput, `Name the system as LAB/SYSTEM (e.g. demo/copper-rinse-tank)${text ? `, not "${text}"` : ''}`)
  const [, lab, system] = match as unknown as [string, string, string]
  return { lab, system, path: `/api/labs/${encodeURIComponent(lab)}/systems/${encodeURIComponent(system)}` }
}
