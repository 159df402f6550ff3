// Compressed answers: a solver sweep sent as brotli or gzip decodes to the
// same JSON as the uncompressed answer; static assets are served
// precompressed; a client that accepts nothing gets plain JSON.
import { brotliDecompressSync, gunzipSync } from 'node:zlib'
import { beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { siteOrigin, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

const sweepSource = `system "Vinegar rinse"
activity ideal
component H+ balance
component CH3COO- total 100 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 cite "acetic acid, 25 C (from memory)"
sweep pH from 3 to 7 points 200
`

/** POST /api/solve with the given Accept-Encoding; the raw bytes and headers (fetch would decode them). */
async function solveRaw(me: SignedIn, acceptEncoding: string): Promise<{ status: number, encoding: string | null, vary: string | null, bytes: Buffer }> {
  const { request } = await import('node:http')
  return new Promise((resolve, reject) => {
    const req = request(url('/api/solve'), {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'accept': 'application/json', 'accept-encoding': acceptEncoding, 'origin': siteOrigin(), 'cookie': me.cookie },
    }, (res) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => resolve({ status: res.statusCode ?? 0, encoding: (res.headers['content-encoding'] as string | undefined) ?? null, vary: (res.headers.vary as string | undefined) ?? null, bytes: Buffer.concat(chunks) }))
    })
    req.on('error', reject)
    req.end(JSON.stringify({ source: sweepSource }))
  })
}

/** The answer without its timing, which differs from run to run. */
const withoutTiming = (text: string) => {
  const answer = JSON.parse(text)
  delete answer.elapsedMs
  return answer
}

let me: SignedIn
beforeAll(async () => { me = await signUp('compress') })

describe('compressed JSON answers', () => {
  it('sends a sweep as brotli or gzip that decodes to the same JSON as the plain answer', async () => {
    const plain = await solveRaw(me, 'identity')
    expect(plain.status).toBe(200)
    expect(plain.encoding).toBeNull()
    const expected = withoutTiming(plain.bytes.toString('utf8'))
    expect(expected.result.points).toHaveLength(200)

    const br = await solveRaw(me, 'gzip, deflate, br')
    expect(br.encoding).toBe('br')
    expect(br.vary).toMatch(/accept-encoding/i)
    expect(withoutTiming(brotliDecompressSync(br.bytes).toString('utf8'))).toEqual(expected)
    // A pH sweep's answer is repetitive text: far smaller on the wire.
    expect(br.bytes.length).toBeLessThan(plain.bytes.length / 4)

    const gz = await solveRaw(me, 'gzip')
    expect(gz.encoding).toBe('gzip')
    expect(withoutTiming(gunzipSync(gz.bytes).toString('utf8'))).toEqual(expected)
  })

  it('compresses an ordinary JSON answer too, and a refused sweep still says what to change', async () => {
    const answer = await fetch(url('/api/examples'), { headers: { 'accept-encoding': 'gzip', 'cookie': me.cookie } })
    // fetch decodes it; the header says it was compressed on the wire.
    expect(answer.status).toBe(200)
    const text = await answer.text()
    expect(Buffer.byteLength(text)).toBeGreaterThan(1024)
    expect(answer.headers.get('content-encoding')).toBe('gzip')
    expect(JSON.parse(text).examples.length).toBeGreaterThan(0)

    const refused = await fetch(url('/api/solve'), {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'accept': 'application/json', 'accept-encoding': 'br', 'origin': siteOrigin(), 'cookie': me.cookie },
      body: JSON.stringify({ source: sweepSource.replace('points 200', 'points 6000') }),
    })
    expect(refused.status).toBe(422)
    expect((await refused.json()).message).toMatch(/points must be a whole number from 2 to 5000/)
  })
})

describe('static assets', () => {
  it('serves the page scripts precompressed to a browser that accepts brotli', async () => {
    const page = await (await fetch(url('/login'))).text()
    const script = page.match(/\/_nuxt\/[\w.-]+\.js/)?.[0]
    expect(script).toBeTruthy()
    const { request } = await import('node:http')
    const { encoding, length } = await new Promise<{ encoding: string | null, length: number }>((resolve, reject) => {
      request(url(script!), { headers: { 'accept-encoding': 'br, gzip' } }, (res) => {
        let n = 0
        res.on('data', (c: Buffer) => { n += c.length })
        res.on('end', () => resolve({ encoding: (res.headers['content-encoding'] as string | undefined) ?? null, length: n }))
      }).on('error', reject).end()
    })
    expect(encoding).toBe('br')
    expect(length).toBeGreaterThan(0)
  })
})
