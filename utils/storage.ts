/**
 * The browser's localStorage, or null on the server and where the browser
 * refuses it (private windows, storage switched off): what is remembered
 * there is then simply forgotten.
 */
export function browserStorage(): Storage | null {
  try {
    return typeof window === 'undefined' ? null : window.localStorage
  } catch {
    return null
  }
}
