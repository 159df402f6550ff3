/**
 * `npm run worker [-- --concurrency N]`: takes study jobs (stored runs) from
 * the queue on Redis and computes them. It needs only the Redis URL
 * (scripts/redis-url.mjs) and the database URL (NUXT_DATABASE_URL), so
 * workers can run on other machines than the web servers.
 *
 * The process started first is a supervisor: it starts N worker processes
 * (default: one per core but one, at least one) and starts a new one when
 * one dies. Each worker process takes one job at a time; its main thread
 * holds the job's lock, records progress and watches for a cancel, and a
 * solver thread (server/jobs/thread.ts) computes. Bundled with esbuild into
 * dist/worker.mjs (scripts/build-worker.mjs), which starts without compiling
 * TypeScript.
 */
import { fork } from 'node:child_process'
import { availableParallelism, hostname } from 'node:os'
import { fileURLToPath } from 'node:url'
import { isMainThread, parentPort, Worker as Thread } from 'node:worker_threads'
import { DelayedError, Queue, Worker, type Job } from 'bullmq'
import { databaseUrlFromEnv, openDatabase } from '../database/connect'
import type { Model } from '../../shared/poise/model'
import { SOLVER_VERSION } from '../solver/index'
import { SOLVE_LIMITS } from '../utils/solve-limits'
import { redisConnection, STUDY_QUEUE, WORKER_LOCK, type StudyJobData } from './connection'
import { claimJob, endJob, failJob, nextPoint, recordProgress, saveSlice, storedCount, storedParts } from './store'
import type { Slice, StoredPart } from './studies'
import { serveStudies, type ThreadAnswer, type ThreadRequest } from './thread'

/** How often the main thread records progress and looks for a cancel while a slice runs: a cancel stops the job within about this. */
const WATCH_EVERY_MS = 250

/** A request without its id, for each kind of request. */
type Unsent<T> = T extends unknown ? Omit<T, 'id'> : never

type Pending = { resolve: (answer: ThreadAnswer) => void, reject: (error: Error) => void, progress?: (done: number) => void }

/** The worker process's solver thread, restarted if it dies. */
class SolverThread {
  private thread!: Thread
  private nextId = 1
  private readonly pending = new Map<number, Pending>()

  constructor() {
    this.start()
  }

  private start() {
    this.thread = new Thread(fileURLToPath(import.meta.url))
    this.thread.on('message', (answer: ThreadAnswer) => {
      const waiting = this.pending.get(answer.id)
      if (!waiting) return
      if (answer.type === 'progress') return waiting.progress?.(answer.done)
      this.pending.delete(answer.id)
      waiting.resolve(answer)
    })
    this.thread.on('exit', (code) => {
      for (const waiting of this.pending.values()) waiting.reject(new Error(`The solver thread stopped (exit code ${code}).`))
      this.pending.clear()
      this.start()
    })
  }

  private ask(request: Unsent<ThreadRequest>, progress?: (done: number) => void): Promise<ThreadAnswer> {
    const id = this.nextId++
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject, progress })
      this.thread.postMessage({ ...request, id })
    })
  }

  async slice(kind: string, model: Model, from: number, to: number, stop: SharedArrayBuffer, progress: (done: number) => void): Promise<Slice> {
    const answer = await this.ask({ op: 'slice', kind, model, from, to, sliceMs: SOLVE_LIMITS.jobSliceMs, stop }, progress)
    if (answer.type === 'error') throw new Error(answer.message)
    return (answer as Extract<ThreadAnswer, { type: 'slice' }>).slice
  }

  /** The stored answer, and its failed points when the kind counts them itself (`failedOf`). */
  async finish(kind: string, model: Model, parts: StoredPart[], complete: boolean): Promise<{ resultJson: string | null, failed?: number }> {
    const answer = await this.ask({ op: 'finish', kind, model, parts, complete })
    if (answer.type === 'error') throw new Error(answer.message)
    const { resultJson, failed } = answer as Extract<ThreadAnswer, { type: 'finished' }>
    return { resultJson, failed }
  }

  close() {
    return this.thread.terminate()
  }
}

export function workerName(): string {
  return `${hostname()}:${process.pid}`
}

async function runWorker(): Promise<void> {
  const { db, pool } = openDatabase(databaseUrlFromEnv())
  const solver = new SolverThread()
  const redis = redisConnection()
  const queue = new Queue(STUDY_QUEUE, { connection: redis })
  const name = workerName()
  let closing = false
  /** The running slice's stop flag, raised on shutdown too. */
  let stopFlag: Int32Array | null = null

  /** Whether a job of another run waits for a worker: then this one goes back in the queue after its slice. */
  async function othersWait(runId: number): Promise<boolean> {
    const waiting = await queue.getJobs(['prioritized', 'wait'], 0, 20, true)
    return waiting.some((other) => other?.data?.runId !== runId)
  }

  /**
   * Counts a range of a run as ended (all its points stored, or stopped by a
   * cancel); true when it is the last one. A range counted twice (its worker
   * died after counting) only ends a cancelled run early.
   */
  async function lastRangeEnded(runId: number, ranges: number): Promise<boolean> {
    const key = `${STUDY_QUEUE}:ended:run-${runId}`
    const ended = await redis.incr(key)
    await redis.expire(key, 24 * 3600)
    return ended >= ranges
  }

  async function handle(job: Job<StudyJobData>, token?: string): Promise<string> {
    const { runId, budgetBytes } = job.data
    const claimed = await claimJob(db, runId, name)
    if (!claimed) return 'ended'
    const model = JSON.parse(claimed.model) as Model
    const to = job.data.to ?? claimed.pointsTotal
    const ranges = job.data.ranges ?? 1
    let next = await nextPoint(db, runId, job.data.from ?? 0, to)
    let cancelled = claimed.cancelRequested
    let complete = await storedCount(db, runId) >= claimed.pointsTotal
    while (!cancelled && next < to) {
      const stop = new SharedArrayBuffer(4)
      stopFlag = new Int32Array(stop)
      let inSlice = 0
      let watching = true
      const watch = (async () => {
        while (watching) {
          await new Promise((r) => setTimeout(r, WATCH_EVERY_MS))
          if (!watching) break
          const seen = await recordProgress(db, runId, inSlice).catch(() => ({ stop: false }))
          if (seen.stop) {
            cancelled = true
            Atomics.store(stopFlag!, 0, 1)
          }
        }
      })()
      let slice: Slice
      try {
        slice = await solver.slice(claimed.kind, model, next, to, stop, (n) => { inSlice = n })
      } finally {
        watching = false
        await watch
      }
      const saved = await saveSlice(db, runId, next, slice)
      if (saved === 'refused') return 'taken over'
      if (saved === 'complete') complete = true
      next += slice.count
      if (closing || (!cancelled && next < to && await othersWait(runId))) {
        // Another run's job waits (or this worker stops): go back in the queue, and go on from here later.
        await job.moveToDelayed(Date.now(), token)
        throw new DelayedError()
      }
    }
    // The run ends when its last point is stored, or, cancelled, when its last range has stopped.
    if (!complete && !(await lastRangeEnded(runId, ranges) && cancelled)) return cancelled ? 'stopped' : 'range done'
    const { parts, points, failed } = await storedParts(db, runId)
    const finished = await solver.finish(claimed.kind, model, parts, complete)
    const resultJson = finished.resultJson
    const ended = await endJob(db, runId, {
      jobStatus: complete ? 'done' : 'cancelled', resultJson, failedPoints: finished.failed ?? failed, pointsDone: points,
      solverVersion: SOLVER_VERSION, budgetBytes, labId: claimed.labId,
    })
    return ended ?? 'ended'
  }

  const worker = new Worker<StudyJobData>(STUDY_QUEUE, async (job, token) => {
    try {
      return await handle(job, token)
    } catch (error) {
      if (error instanceof DelayedError) throw error
      console.error(`[worker ${name}] run ${job.data.runId}:`, error)
      const database = (error as { sqlMessage?: string }).sqlMessage
      await failJob(db, job.data.runId, database
        ? `The answer could not be stored: the database refused it (${database}). Try fewer points, or ask the site administrator to look at the database's settings.`
        : 'The solver failed unexpectedly on this system. The text was not changed; please report it with the file.')
      return 'failed'
    }
  }, { connection: redisConnection(), concurrency: 1, ...WORKER_LOCK })
  worker.on('error', (error) => console.error(`[worker ${name}]`, error.message))
  console.log(`Study worker ${name} waiting for jobs`)

  const shutdown = async () => {
    if (closing) return
    closing = true
    if (stopFlag) Atomics.store(stopFlag, 0, 1)
    await worker.close()
    await queue.close()
    await solver.close()
    await pool.end()
    process.exit(0)
  }
  process.on('SIGTERM', shutdown)
  process.on('SIGINT', shutdown)
}

/** `--concurrency N` (or `-c N`): worker processes to start; default one per core but one, at least one. */
export function concurrencyOf(argv: string[]): number {
  const at = argv.findIndex((arg) => arg === '--concurrency' || arg === '-c' || arg.startsWith('--concurrency='))
  const fallback = Math.max(1, availableParallelism() - 1)
  if (at < 0) return fallback
  const text = argv[at]!.includes('=') ? argv[at]!.split('=')[1] : argv[at + 1]
  const n = Number(text)
  if (!Number.isInteger(n) || n < 1) {
    console.error(`--concurrency wants a whole number of worker processes, 1 or more (got ${text ?? 'nothing'}).`)
    process.exit(2)
  }
  return n
}

/** Starts N worker processes and starts a new one whenever one dies, until stopped. */
function supervise(count: number): void {
  const entry = fileURLToPath(import.meta.url)
  let stopping = false
  const children = new Set<ReturnType<typeof fork>>()
  const startOne = () => {
    const child = fork(entry, [], { env: { ...process.env, EQUIPOISE_WORKER_PROCESS: '1' }, stdio: 'inherit' })
    children.add(child)
    child.on('exit', (code, signal) => {
      children.delete(child)
      if (stopping) {
        if (!children.size) process.exit(0)
        return
      }
      console.error(`A study worker stopped (${signal ?? `exit code ${code}`}); starting another. Its job is taken up again once its lock runs out.`)
      setTimeout(startOne, 500)
    })
  }
  for (let i = 0; i < count; i++) startOne()
  console.log(`Starting ${count} study worker process${count === 1 ? '' : 'es'} (--concurrency ${count})`)
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.on(signal, () => {
      stopping = true
      for (const child of children) child.kill('SIGTERM')
      if (!children.size) process.exit(0)
    })
  }
}

if (!isMainThread) serveStudies(parentPort!)
else if (process.env.EQUIPOISE_WORKER_PROCESS === '1') await runWorker()
else supervise(concurrencyOf(process.argv.slice(2)))
