// The progress line of a run on the queue says what it counts: points, or a Monte Carlo run's draws.
import { describe, expect, it } from 'vitest'
import { progressWords } from '../../../shared/types/job'

describe('progressWords', () => {
  it('counts points, or draws when the run counts draws', () => {
    expect(progressWords('running', { done: 1200, total: 5000, elapsedMs: 3000, remainingMs: 9500 })).toBe('1,200 of 5,000 points · 3.0 s · about 9.5 s left')
    expect(progressWords('running', { done: 40, total: 2000, elapsedMs: 3000, remainingMs: 147_000, unit: 'draws' })).toMatch(/^40 of 2,000 draws · /)
    expect(progressWords('queued', { done: 0, total: 2000, elapsedMs: 0, remainingMs: null, unit: 'draws' })).toBe('Queued, waiting for a worker')
  })
})
