/**
 * The one date formatter of the pages. Always English (en-GB) and always in
 * UTC, named as such, so the server's HTML and the browser's hydration write
 * the same text whatever zone or locale either machine has, and two people in
 * different zones read the same time.
 *
 *   date      5 Dec 2026
 *   dayMonth  5 Dec
 *   dateTime  5 Dec 2026, 13:01 UTC
 *   long      5 December 2026 at 13:01 UTC   (the printed report)
 *   time      13:01:07 UTC
 */
export type DateStyle = 'date' | 'dayMonth' | 'dateTime' | 'long' | 'time'

const UTC = { timeZone: 'UTC' } as const
const FORMATS: Record<DateStyle, Intl.DateTimeFormat> = {
  date: new Intl.DateTimeFormat('en-GB', { ...UTC, day: 'numeric', month: 'short', year: 'numeric' }),
  dayMonth: new Intl.DateTimeFormat('en-GB', { ...UTC, day: 'numeric', month: 'short' }),
  dateTime: new Intl.DateTimeFormat('en-GB', { ...UTC, day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' }),
  long: new Intl.DateTimeFormat('en-GB', { ...UTC, day: 'numeric', month: 'long', year: 'numeric', hour: '2-digit', minute: '2-digit' }),
  time: new Intl.DateTimeFormat('en-GB', { ...UTC, hour: '2-digit', minute: '2-digit', second: '2-digit' }),
}
const WITH_TIME = new Set<DateStyle>(['dateTime', 'long', 'time'])

/** `at` as text in one of the styles above; an unreadable date gives '—'. */
export function formatDate(at: string | number | Date | null | undefined, style: DateStyle = 'dateTime'): string {
  if (at === null || at === undefined || at === '') return '—'
  const date = at instanceof Date ? at : new Date(at)
  if (Number.isNaN(date.getTime())) return '—'
  const text = FORMATS[style].format(date)
  return WITH_TIME.has(style) ? `${text} UTC` : text
}
