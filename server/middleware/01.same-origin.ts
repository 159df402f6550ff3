/**
 * Cross-origin writes are refused: a POST, PUT, PATCH or DELETE whose Origin
 * header (or, without one, Referer) is not the site's own origin gets a 403
 * before any route runs, so another site cannot make a signed-in person's
 * browser change things here. Browsers send Origin with every such request;
 * a request with neither header comes from a script or the command line,
 * which carries no one's cookie by accident, and is let through; so is a
 * request with an API token (Authorization: Bearer) and no session cookie,
 * which no other site can make a browser send.
 */
import { WRITE_METHODS } from '../utils/request-limits'
import { isBearerOnly } from '../utils/api-tokens'

function originOf(value: string): string {
  try {
    return new URL(value).origin
  } catch {
    return value
  }
}

export default defineEventHandler((event) => {
  if (!WRITE_METHODS.has(event.method)) return
  if (isBearerOnly(event)) return
  const origin = getRequestHeader(event, 'origin')
  const referer = getRequestHeader(event, 'referer')
  const from = origin !== undefined ? origin : referer ? originOf(referer) : undefined
  if (from === undefined) return
  const site = siteOrigin()
  if (from === site) return
  throw createError({
    statusCode: 403,
    message: `Refused: this change was sent from ${from || 'an unknown page'}, not from ${site}. Equipoise takes changes only from its own pages; open ${site} and try again.`,
  })
})
