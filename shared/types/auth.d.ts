// The signed-in user kept in the sealed session cookie. Only public facts:
// the server reloads the account (and its admin flag) on every request.
declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
  }
  interface UserSession {
    loggedInAt: number
  }
  // Server-only part of the session (never sent by /api/_auth/session).
  interface SecureSessionData {
    /** The session's random token; the sessions table keeps its sha256 (server/utils/sessions.ts). */
    token: string
  }
}

export {}
