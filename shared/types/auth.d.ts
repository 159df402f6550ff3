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
}

export {}
