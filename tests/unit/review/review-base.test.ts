// The revision a new review is read against unless the person asking chooses another.
import { describe, expect, it } from 'vitest'
import { reviewBase } from '../../../shared/utils/review-base'

describe('reviewBase', () => {
  it('takes the newest approved revision before the one to review', () => {
    expect(reviewBase([2, 5, 3], 7)).toBe(5)
    // An approval of a later revision (or of this one) is no base for it.
    expect(reviewBase([2, 7, 9], 7)).toBe(2)
  })

  it('falls back to the first revision when none was approved', () => {
    expect(reviewBase([], 4)).toBe(1)
    expect(reviewBase([6], 4)).toBe(1)
  })

  it('has no base for the first revision, which has nothing before it', () => {
    expect(reviewBase([], 1)).toBeNull()
  })
})
