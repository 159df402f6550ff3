/**
 * The study queue on Redis (BullMQ): its name, the job's data, and the
 * worker settings that decide how fast a dead worker's job is taken up
 * again. The web server adds jobs (server/utils/jobs.ts); workers
 * (server/jobs/worker.ts) take them. Both find Redis through
 * scripts/redis-url.mjs (EQUIPOISE_REDIS_URL, or the private Redis's port).
 */
import { Redis } from 'ioredis'
import { redisUrl } from '../../scripts/redis-url.mjs'

export const STUDY_QUEUE = 'studies'

/**
 * What a job carries: the run row that holds everything else, the lab's run
 * storage budget the web server read from its configuration, and the range
 * of the run's points this job computes (kinds.ts, `pointRanges`).
 */
export interface StudyJobData {
  runId: number
  budgetBytes: number
  from: number
  to: number
  /** How many ranges (jobs) the run was queued as. */
  ranges: number
}

/** The queue's id of a run's job for its range starting at `from` (`run-ID` for the first): adding it twice adds nothing. */
export function jobIdOf(runId: number, from = 0): string {
  return from === 0 ? `run-${runId}` : `run-${runId}-${from}`
}

/**
 * A worker holds a job under a lock it renews every lockDuration/2; when the
 * worker dies (kill -9, a lost machine) the lock runs out and another
 * worker's stalled-job check (every stalledInterval) puts the job back in
 * the queue, where it goes on from its last stored slice. A job found
 * stalled more than maxStalledCount times fails.
 */
export const WORKER_LOCK = { lockDuration: 5_000, stalledInterval: 2_500, maxStalledCount: 10 } as const

/** A Redis connection as BullMQ needs it (commands wait for a reconnect instead of failing). */
export function redisConnection(): Redis {
  return new Redis(redisUrl(), { maxRetriesPerRequest: null })
}
