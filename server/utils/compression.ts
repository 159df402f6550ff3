/** Which encoding of a JSON answer to send, from the request's Accept-Encoding. */

/** Answers below this many bytes go out as they are: compressing them saves less than it costs. */
export const COMPRESS_MIN_BYTES = 1024

/** 'br' when accepted, else 'gzip' when accepted, else null (q=0 refuses an encoding). */
export function compressionFor(acceptEncoding: string | undefined | null): 'br' | 'gzip' | null {
  const accepted = new Map<string, number>()
  for (const part of String(acceptEncoding ?? '').toLowerCase().split(',')) {
    const [name, ...params] = part.trim().split(';')
    if (!name) continue
    const q = params.map(p => p.trim()).find(p => p.startsWith('q='))
    accepted.set(name.trim(), q ? Number(q.slice(2)) : 1)
  }
  const ok = (name: string) => (accepted.get(name) ?? accepted.get('*') ?? 0) > 0
  if (ok('br')) return 'br'
  if (ok('gzip')) return 'gzip'
  return null
}
