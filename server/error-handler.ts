/**
 * Runs before Nuxt's error handler (added in nuxt.config.ts): an error caused
 * by a database that cannot be reached becomes a 503 with a message a person
 * understands and a Retry-After, for the API's JSON and for pages alike.
 * Everything else passes on unchanged. The pool opens new connections once
 * MariaDB is back, so the server recovers by itself.
 */
import type { H3Error, H3Event } from 'h3'
import { setResponseHeader } from 'h3'
import { DATABASE_UNAVAILABLE_MESSAGE, isDatabaseUnavailable } from './database/unavailable'

export default function databaseUnavailableHandler(error: H3Error, event: H3Event): void {
  if (!isDatabaseUnavailable(error)) return
  const cause = error.cause instanceof Error ? error.cause.message : error.message
  console.error(`[database unavailable] ${event.method} ${event.path}: ${cause}`)
  error.statusCode = 503
  error.statusMessage = 'Service Unavailable'
  error.message = DATABASE_UNAVAILABLE_MESSAGE
  error.unhandled = false
  error.fatal = false
  setResponseHeader(event, 'retry-after', 30)
}
