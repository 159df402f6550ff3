/**
 * The site's own origin (scheme, host and port), configured with
 * NUXT_PUBLIC_SITE_URL. Links in mail are built on it, never on the request's
 * Host header, and state-changing requests must come from it (Origin).
 */

/** The origin of a configured site URL, or null when it is not an absolute http(s) URL. */
export function parseSiteUrl(value: string): string | null {
  try {
    const url = new URL(value)
    if (url.protocol !== 'http:' && url.protocol !== 'https:') return null
    return url.origin
  } catch {
    return null
  }
}

export const SITE_URL_MISSING = 'set NUXT_PUBLIC_SITE_URL to the address people open the site at, for example NUXT_PUBLIC_SITE_URL=https://equipoise.example.org '
  + '(links in mail are built on it, and writes from any other origin are refused). `npm start` sets it to the local address it serves.'

export function siteOrigin(): string {
  const configured = String(useRuntimeConfig().public.siteUrl || '')
  const origin = parseSiteUrl(configured)
  if (origin) return origin
  // Only `nuxt dev` gets this far without one (the built server refuses to start, server/plugins/site-origin.ts).
  if (import.meta.dev) return `http://localhost:${process.env.PORT || 3000}`
  throw createError({ statusCode: 500, message: `The site address is not configured: ${SITE_URL_MISSING}` })
}
