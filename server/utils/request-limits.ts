/**
 * How large a request body may be, and what a write may be sent as: the one
 * place these limits are defined. `server/middleware/02.request-body.ts`
 * applies them to every request while its body streams in (chunked bodies
 * included), before any route reads it.
 */
import { SOURCE_MAX_LENGTH } from '../../shared/utils/lab-schemas'
import { UPLOAD_MAX_BYTES } from '../../shared/utils/upload-schemas'

/** The methods that change state: their requests must come from the site's own origin and send JSON. */
export const WRITE_METHODS: ReadonlySet<string> = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

/** Room for the multipart boundaries and the small text fields sent beside an uploaded file. */
export const FORM_OVERHEAD_BYTES = 16 * 1024

export const BODY_LIMITS = {
  /** Without a session: sign-in, registration, password reset, invitation sign-up. Their bodies are a few short fields. */
  anonymousBytes: 16 * 1024,
  /**
   * Signed in: the largest JSON a route takes is a Poise text of
   * SOURCE_MAX_LENGTH characters (at most 3 bytes each in UTF-8 and JSON)
   * with a message and a few fields.
   */
  signedInBytes: 1024 * 1024,
  /** The upload routes: one file of UPLOAD_MAX_BYTES and its form. */
  uploadBytes: UPLOAD_MAX_BYTES + FORM_OVERHEAD_BYTES,
  /**
   * A body over its limit is read to its end and thrown away, so the client
   * (still sending) gets the 413 and its message, up to this size; past it
   * the connection is closed instead.
   */
  discardUpToBytes: 8 * 1024 * 1024,
} as const

/** The routes that take a multipart upload (a `.poise` or data set file); every other write takes JSON. */
const UPLOAD_ROUTES = [
  /^\/api\/labs\/[^/]+\/imports\/?$/,
  /^\/api\/labs\/[^/]+\/systems\/[^/]+\/imports\/?$/,
  /^\/api\/labs\/[^/]+\/systems\/[^/]+\/datasets\/?$/,
]

export function isUploadRoute(path: string): boolean {
  const pathname = path.split('?')[0]!
  return UPLOAD_ROUTES.some((pattern) => pattern.test(pathname))
}

export interface BodyLimit {
  bytes: number
  /** What the limit is for, for the 413 message. */
  kind: 'anonymous' | 'signed-in' | 'upload'
}

export function bodyLimitFor(path: string, signedIn: boolean): BodyLimit {
  if (!signedIn) return { bytes: BODY_LIMITS.anonymousBytes, kind: 'anonymous' }
  if (isUploadRoute(path)) return { bytes: BODY_LIMITS.uploadBytes, kind: 'upload' }
  return { bytes: BODY_LIMITS.signedInBytes, kind: 'signed-in' }
}

/** "16 KiB", "1 MiB": a size as people read it. */
export function byteLabel(bytes: number): string {
  if (bytes >= 1024 * 1024 && bytes % (1024 * 1024) === 0) return `${bytes / (1024 * 1024)} MiB`
  if (bytes >= 1024 * 1024) return `${(bytes / (1024 * 1024)).toFixed(1)} MiB`
  return `${Math.round(bytes / 1024)} KiB`
}

export function tooLargeMessage(limit: BodyLimit): string {
  const label = byteLabel(limit.bytes)
  switch (limit.kind) {
    case 'anonymous':
      return `The request body is larger than ${label}, the most accepted without signing in. Send only the fields of the form.`
    case 'upload':
      return `The upload is larger than ${byteLabel(UPLOAD_MAX_BYTES)}, the most a file may be (${label} for the whole request with its form). Split the system, or move shared constants into a lab library.`
    default:
      return `The request body is larger than ${label}, the most one request may send. A Poise text may have at most ${SOURCE_MAX_LENGTH.toLocaleString('en')} characters; split the system or move shared constants into a lab library.`
  }
}
