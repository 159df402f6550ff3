import { describe, expect, it } from 'vitest'
import { jsonBytesWithRaw, jsonWithRaw } from '../../../server/utils/raw-json'

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
})

describe('jsonBytesWithRaw', () => {
  it('gives the bytes of the same JSON around raw bytes, non-ASCII text intact', () => {
    const head = { kind: 'sweep', diagnostics: [{ message: 'log₁₀ γ of Cu²⁺ — "a note"' }] }
    const raw = JSON.stringify({ species: [{ name: 'Cu²⁺', log10: -3.5 }] })
    const bytes = jsonBytesWithRaw(head, 'result', new TextEncoder().encode(raw))
    expect(bytes.toString('utf8')).toBe(jsonWithRaw(head, 'result', raw))
    expect(JSON.parse(bytes.toString('utf8'))).toEqual({ ...head, result: JSON.parse(raw) })
  })
})
