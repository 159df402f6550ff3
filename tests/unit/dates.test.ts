import { describe, expect, it } from 'vitest'
import { formatDate } from '../../utils/dates'

describe('formatDate, the one date formatter of the pages', () => {
  it('writes every style in UTC and says so where a time is shown', () => {
    const at = '2026-12-05T23:30:07Z'
    expect(formatDate(at, 'date')).toBe('5 Dec 2026')
    expect(formatDate(at, 'dayMonth')).toBe('5 Dec')
    expect(formatDate(at, 'dateTime')).toBe('5 Dec 2026, 23:30 UTC')
    expect(formatDate(at, 'long')).toBe('5 December 2026 at 23:30 UTC')
    expect(formatDate(at, 'time')).toBe('23:30:07 UTC')
  })

  it('gives a dash, never "Invalid Date", for a missing or unreadable date', () => {
    expect(formatDate(null)).toBe('—')
    expect(formatDate('')).toBe('—')
    expect(formatDate('not a date')).toBe('—')
  })
})
