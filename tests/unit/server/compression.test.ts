// Which encoding a JSON answer goes out in, from the request's Accept-Encoding (RFC 9110, section 12.5.3).
import { describe, expect, it } from 'vitest'
import { compressionFor } from '../../../server/utils/compression'

describe('compressionFor', () => {
  it('prefers brotli, then gzip', () => {
    expect(compressionFor('gzip, deflate, br')).toBe('br')
    expect(compressionFor('gzip, deflate')).toBe('gzip')
    expect(compressionFor('GZIP')).toBe('gzip')
  })
  it('sends nothing compressed when nothing usable is accepted', () => {
    expect(compressionFor(undefined)).toBeNull()
    expect(compressionFor('')).toBeNull()
    expect(compressionFor('identity')).toBeNull()
    expect(compressionFor('deflate')).toBeNull()
  })
  it('honours q=0 as a refusal and the wildcard', () => {
    expect(compressionFor('br;q=0, gzip')).toBe('gzip')
    expect(compressionFor('br;q=0, gzip;q=0')).toBeNull()
    expect(compressionFor('*')).toBe('br')
    expect(compressionFor('*, br;q=0')).toBe('gzip')
  })
})
