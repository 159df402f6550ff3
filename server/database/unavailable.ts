/**
 * Telling a database that cannot be reached (stopped, restarting, the
 * connection dropped or refused) from any other failure, so the server can
 * answer 503 with a message a person understands instead of a bare 500.
 * Plain TypeScript: the error handler and a unit test share it.
 */

/** Socket errors of Node and the connection errors of the mysql2 driver and MariaDB. */
const CONNECTION_CODES = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'ENOTFOUND', 'EAI_AGAIN', 'EPIPE',
  'PROTOCOL_CONNECTION_LOST', 'PROTOCOL_SEQUENCE_TIMEOUT', 'PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR', 'POOL_CLOSED',
  'ER_CON_COUNT_ERROR', 'ER_SERVER_SHUTDOWN', 'ER_CONNECTION_KILLED', 'ER_NORMAL_SHUTDOWN', 'ER_SHUTDOWN_COMPLETE',
])

/** MariaDB error numbers of the same (too many connections, shutdown in progress, connection killed). */
const CONNECTION_ERRNOS = new Set([1040, 1053, 1077, 1079, 1927, 2002, 2003, 2006, 2013])

export const DATABASE_UNAVAILABLE_MESSAGE = 'Equipoise cannot reach its database just now, so this request was not carried out. '
  + 'Wait a minute and try again (what you typed is still on the page); if it goes on, tell whoever runs this site.'

interface MaybeConnectionError {
  code?: unknown
  errno?: unknown
  fatal?: unknown
  message?: unknown
  cause?: unknown
}

/** True when the error, or one of its causes, says the database could not be reached or the connection was lost. */
export function isDatabaseUnavailable(error: unknown): boolean {
  let current: unknown = error
  for (let depth = 0; depth < 6 && current && typeof current === 'object'; depth += 1) {
    const e = current as MaybeConnectionError
    if (typeof e.code === 'string' && CONNECTION_CODES.has(e.code)) return true
    if (typeof e.errno === 'number' && CONNECTION_ERRNOS.has(e.errno)) return true
    // mysql2 marks errors after which the connection is unusable as fatal.
    if (e.fatal === true && typeof e.code === 'string') return true
    if (typeof e.message === 'string' && /^Pool is closed|Can't add new command when connection is in closed state/.test(e.message)) return true
    current = e.cause
  }
  return false
}
