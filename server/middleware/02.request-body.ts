/**
 * Every request body passes here before a route reads it:
 * - a write to /api/ must be JSON, or multipart/form-data on the upload
 *   routes (415 otherwise), so a plain HTML form on another site cannot post;
 * - its size is counted as it streams in, Content-Length or chunked alike,
 *   against the limit of BODY_LIMITS (request-limits.ts): tighter without a
 *   session, the upload limit on the upload routes. Past the limit nothing
 *   more is kept and the answer is 413 naming the limit. The rest of a body
 *   up to BODY_LIMITS.discardUpToBytes is read and thrown away first, so a
 *   client still sending sees the answer; past that the connection is closed.
 * The body read here is handed to the route's readBody / readMultipartFormData.
 */
import type { IncomingMessage } from 'node:http'
import type { H3Event } from 'h3'
import { hasBearer } from '../utils/api-tokens'
import { requireUser } from '../utils/current-user'
import { BODY_LIMITS, bodyLimitFor, isUploadRoute, tooLargeMessage, WRITE_METHODS, type BodyLimit } from '../utils/request-limits'

function tooLarge(limit: BodyLimit) {
  return createError({ statusCode: 413, statusMessage: 'Content Too Large', message: tooLargeMessage(limit), data: { limitBytes: limit.bytes } })
}

function checkContentType(event: H3Event, path: string): void {
  const type = (getRequestHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
  if (isUploadRoute(path)) {
    if (type === 'multipart/form-data') return
    throw createError({ statusCode: 415, statusMessage: 'Unsupported Media Type', message: 'Send the file as multipart/form-data, in a field named "file"' })
  }
  if (type === 'application/json' || /^application\/[a-z0-9.+-]+\+json$/.test(type)) return
  throw createError({ statusCode: 415, statusMessage: 'Unsupported Media Type', message: `Send the request body as JSON (Content-Type: application/json)${type ? `, not ${type}` : ''}` })
}

async function isSignedIn(event: H3Event): Promise<boolean> {
  if (hasBearer(event)) {
    // An API token counts when it is good; a read token refused a write (403) is still a signed-in caller.
    try {
      await requireUser(event)
      return true
    } catch (error) {
      return (error as { statusCode?: number }).statusCode === 403
    }
  }
  const cookieName = (useRuntimeConfig().session as { name?: string } | undefined)?.name || 'nuxt-session'
  if (!getCookie(event, cookieName)) return false
  const session = await getUserSession(event)
  return Boolean(session.user)
}

/** Reads the body, keeping at most `limit.bytes`; a larger one is thrown away (up to discardUpToBytes) and refused. */
function readLimited(event: H3Event, req: IncomingMessage, limit: BodyLimit): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let received = 0
    let over = false
    const cleanup = () => {
      req.off('data', onData)
      req.off('end', onEnd)
      req.off('error', onError)
    }
    const onData = (chunk: Buffer) => {
      received += chunk.length
      if (!over && received <= limit.bytes) {
        chunks.push(chunk)
        return
      }
      over = true
      chunks.length = 0
      if (received <= BODY_LIMITS.discardUpToBytes) return
      // Far too large: stop reading, answer, and close the connection.
      cleanup()
      setResponseHeader(event, 'connection', 'close')
      reject(tooLarge(limit))
    }
    const onEnd = () => {
      cleanup()
      if (over) reject(tooLarge(limit))
      else resolve(Buffer.concat(chunks))
    }
    const onError = (error: Error) => {
      cleanup()
      reject(createError({ statusCode: 400, message: `The request body could not be read (${error.message}); send it again` }))
    }
    req.on('data', onData)
    req.on('end', onEnd)
    req.on('error', onError)
  })
}

export default defineEventHandler(async (event) => {
  const req = event.node.req
  const declared = req.headers['content-length']
  const chunked = /\bchunked\b/i.test(String(req.headers['transfer-encoding'] ?? ''))
  if (!chunked && !(Number(declared) > 0)) return
  const path = event.path.split('?')[0]!
  if (WRITE_METHODS.has(event.method) && path.startsWith('/api/')) checkContentType(event, path)
  const limit = bodyLimitFor(path, await isSignedIn(event))
  if (declared !== undefined && Number(declared) > BODY_LIMITS.discardUpToBytes) {
    setResponseHeader(event, 'connection', 'close')
    throw tooLarge(limit)
  }
  const body = await readLimited(event, req, limit)
  // h3's readRawBody (and so readBody and readMultipartFormData) takes the body from here.
  ;(event as unknown as { _requestBody?: Buffer })._requestBody = body
})
