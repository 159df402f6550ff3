import { describe, expect, it } from 'vitest'
import { jsonWithRaw } from '../../../server/utils/raw-json'

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
