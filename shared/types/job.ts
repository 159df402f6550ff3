/**
 * A stored run is a job on the study queue (server/jobs/): where it is in its
 * life, and how far it has got. Shared by the server, the browser and the CLI.
 */

/** queued → running → done | failed | cancelled; a run stored before runs were jobs is `done`. */
export const JOB_STATUSES = ['queued', 'running', 'done', 'failed', 'cancelled'] as const
export type JobStatus = (typeof JOB_STATUSES)[number]

/** The statuses a job can still leave: it holds a place in the account's limit and may be cancelled. */
export const ACTIVE_JOB_STATUSES = ['queued', 'running'] as const satisfies readonly JobStatus[]

export function jobIsActive(status: JobStatus): boolean {
  return (ACTIVE_JOB_STATUSES as readonly JobStatus[]).includes(status)
}

/** How far a job has got: points done of total, time since it started, and a guess at the time left. */
export interface JobProgress {
  done: number
  total: number
  /** Milliseconds since a worker started it; 0 while queued. */
  elapsedMs: number
  /** Estimated milliseconds left at the rate so far; null until a point is done or once it ended. */
  remainingMs: number | null
  /** What `done` and `total` count: the study's points (when absent) or, for a Monte Carlo run, its draws. */
  unit?: 'points' | 'draws'
}

/** A duration for people: "0.4 s", "12 s", "3 min 05 s", "1 h 02 min". */
export function durationWords(ms: number): string {
  if (!Number.isFinite(ms) || ms < 0) return '—'
  if (ms < 10_000) return `${(ms / 1000).toFixed(1)} s`
  const s = Math.round(ms / 1000)
  if (s < 60) return `${s} s`
  const m = Math.floor(s / 60)
  if (m < 60) return `${m} min ${String(s % 60).padStart(2, '0')} s`
  return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, '0')} min`
}

/** Where a job is, in one line: "Queued", "1,200 of 5,000 points · 4.1 s · about 13 s left". */
export function progressWords(status: JobStatus, progress: JobProgress): string {
  if (status === 'queued') return 'Queued, waiting for a worker'
  const points = progress.total > 1 ? `${progress.done.toLocaleString('en-US')} of ${progress.total.toLocaleString('en-US')} ${progress.unit ?? 'points'} · ` : ''
  const left = progress.remainingMs === null ? '' : ` · about ${durationWords(progress.remainingMs)} left`
  return `${points}${durationWords(progress.elapsedMs)}${left}`
}

const OUTCOME_WORDS = { ok: 'solved', diverged: 'did not converge', failed: 'failed' } as const

/** A run's state in a word or two, for lists: "queued", "running", "solved", "did not converge", "failed", "cancelled". */
export function runStateWords(run: { status: keyof typeof OUTCOME_WORDS | null, jobStatus: JobStatus }): string {
  if (run.jobStatus !== 'done') return run.jobStatus
  return run.status ? OUTCOME_WORDS[run.status] : 'solved'
}

/** Whether a run's state reads as good news (the accent colour) rather than a caution. */
export function runStateIsGood(run: { status: string | null, jobStatus: JobStatus }): boolean {
  return run.jobStatus === 'done' ? run.status === 'ok' : jobIsActive(run.jobStatus)
}
