/**
 * Runs before Nuxt's error handler (added in nuxt.config.ts): an error caused
 * by a database that cannot be reached becomes a 503 with a message a person
 * understands and a Retry-After, for the API's JSON and for pages alike.
 * The pool opens new connections once MariaDB is back, so the server recovers
 * by itself. A refusal thrown without a status text (a 401, 403, 404, 409…)
 * gets its standard reason phrase, where the built-in handler would otherwise
 * call every such answer "Server Error". Everything else passes on unchanged.
 */
import { STATUS_CODES } from 'node:http'
import type { H3Error, H3Event } from 'h3'
import { setResponseHeader } from 'h3'
import { DATABASE_UNAVAILABLE_MESSAGE, isDatabaseUnavailable } from './database/unavailable'

export default function databaseUnavailableHandler(error: H3Error, event: H3Event): void {
  if (!isDatabaseUnavailable(error)) {
    if (!error.statusMessage && error.statusCode >= 400 && error.statusCode < 500) error.statusMessage = STATUS_CODES[error.statusCode] ?? 'Request Refused'
    return
  }
  const cause = error.cause instanceof Error ? error.cause.message : error.message
  console.error(`[database unavailable] ${event.method} ${event.path}: ${cause}`)
  error.statusCode = 503
  error.statusMessage = 'Service Unavailable'
  error.message = DATABASE_UNAVAILABLE_MESSAGE
  error.unhandled = false
  error.fatal = false
  setResponseHeader(event, 'retry-after', 30)
}
