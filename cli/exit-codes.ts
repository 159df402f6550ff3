/** The exit codes of the `equipoise` command, documented in its --help and the README. */
export const EXIT = {
  ok: 0,
  /** The command ran but did not succeed: a solve that did not converge, the server unreachable or failing. */
  failed: 1,
  /** Bad input: a wrong argument, a missing file, diagnostics with errors, no such lab or system. */
  badInput: 2,
  /** A push whose base revision is no longer the latest. */
  conflict: 3,
  /** Not allowed: no login, an unknown, revoked, expired or read-only token, a role too low. */
  notAllowed: 4,
} as const

export type ExitCode = (typeof EXIT)[keyof typeof EXIT]

/** An error the command line reports as one message and an exit code (never a stack trace). */
export class CliError extends Error {
  constructor(readonly code: ExitCode, message: string) {
    super(message)
  }
}
