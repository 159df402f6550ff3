import { describe, expect, it } from 'vitest'
import { coalesced, jsonBytesWithRaw, jsonBytesWithRaws, jsonWithRaw, jsonWithRaws } from '../../../server/utils/raw-json'

describe('jsonWithRaw', () => {
  it('gives the same JSON as stringifying the parsed value in place', () => {
    const head = { kind: 'sweep', elapsedMs: 12.5, diagnostics: [{ code: 'W105', message: 'a "quoted" note' }] }
    const raw = JSON.stringify({ values: [1, 2], points: [{ pH: 7, converged: true }] })
    const text = jsonWithRaw(head, 'result', raw)
    expect(JSON.parse(text)).toEqual({ ...head, result: JSON.parse(raw) })
  })

  it('works with an empty head and escapes the key', () => {
    expect(JSON.parse(jsonWithRaw({}, 'a"b', '[1]'))).toEqual({ 'a"b': [1] })
    expect(jsonWithRaw({}, 'result', 'null')).toBe('{"result":null}')
  })

  it('carries several raw values (a result and a model) in order', () => {
    const text = jsonWithRaws({ id: 3 }, { result: '{"pH":7}', model: 'null' })
    expect(text).toBe('{"id":3,"result":{"pH":7},"model":null}')
    expect(JSON.parse(jsonWithRaws({}, { a: '1', b: '[2]' }))).toEqual({ a: 1, b: [2] })
  })
})

describe('jsonBytesWithRaw', () => {
  it('gives the bytes of the same JSON around raw bytes, non-ASCII text intact', () => {
    const head = { kind: 'sweep', diagnostics: [{ message: 'log₁₀ γ of Cu²⁺ — "a note"' }] }
    const raw = JSON.stringify({ species: [{ name: 'Cu²⁺', log10: -3.5 }] })
    const bytes = jsonBytesWithRaw(head, 'result', new TextEncoder().encode(raw))
    expect(bytes.toString('utf8')).toBe(jsonWithRaw(head, 'result', raw))
    expect(JSON.parse(bytes.toString('utf8'))).toEqual({ ...head, result: JSON.parse(raw) })
  })

  it('carries raw bytes and raw text side by side (a result and a model)', () => {
    const bytes = jsonBytesWithRaws({ kind: 'single' }, { result: new TextEncoder().encode('{"pH":7}'), model: '{"title":"Bad"}' })
    expect(bytes.toString('utf8')).toBe('{"kind":"single","result":{"pH":7},"model":{"title":"Bad"}}')
    expect(jsonBytesWithRaws({}, { a: '1', b: new TextEncoder().encode('[2]') }).toString('utf8')).toBe('{"a":1,"b":[2]}')
  })
})

describe('coalesced', () => {
  /** Pseudo-random bytes, so a misplaced byte shows. */
  const bytes = (n: number, seed: number) => {
    const b = new Uint8Array(n)
    for (let i = 0; i < n; i++) b[i] = (i * 31 + seed * 7) & 255
    return b
  }

  it('writes many small pieces as a few blocks with the same bytes in order, and large ones as they are', () => {
    const chunks = [...Array.from({ length: 2000 }, (_, k) => bytes(800 + (k % 9) * 8, k)), bytes((1 << 20) + 8, 1), bytes(5, 2), bytes(16, 3)]
    const blocks = [...coalesced(chunks)]
    expect(Buffer.concat(blocks).equals(Buffer.concat(chunks))).toBe(true)
    expect(blocks.length).toBeLessThan(10)
    expect(blocks.includes(chunks[2000])).toBe(true)
    expect(blocks.filter(b => b !== chunks[2000]).every(b => b.byteLength <= 1 << 20)).toBe(true)
  }, 30_000)

  it('gives nothing for nothing', () => {
    expect([...coalesced([])]).toEqual([])
  })
})
