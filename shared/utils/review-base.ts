/**
 * Which revision a new review of revision `to` is read against by default:
 * the newest revision before it that a review approved (so the reviewer sees
 * only what changed since the last approval), else revision 1 (everything).
 * Null when there is nothing before `to` to compare with.
 */
export function reviewBase(approved: Iterable<number>, to: number): number | null {
  if (to <= 1) return null
  let base = 1
  for (const n of approved) if (n < to && n > base) base = n
  return base
}
