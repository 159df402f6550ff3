/**
 * One against two study workers on the same stored run (`npm run bench`;
 * alone: `npx tsx bench/workers.ts`): the built server on
 * a database of its own and a Redis database of its own (2), the run queued
 * through the API as the workbench queues it, timed from the POST to the
 * run's `done`. The run is split into ranges of its points
 * (SOLVE_LIMITS.jobSegmentPoints) that the workers compute at once.
 */
import { Redis } from 'ioredis'
import { freePort } from '../scripts/free-port'
import { redisPort } from '../scripts/redis-url.mjs'
import { buildWorker } from '../scripts/build-worker.mjs'
import { startWorkerProcess } from '../tests/setup/server-process'
import { freshBenchDatabase, signInAsDemoEditor, spawnBuiltServer } from './builtServer'

/** The study timed: a 100 × 50 map over pH and the ammonia total of the bench system (bench/systems.ts). */
export const WORKER_BENCH_MAP = 'map pH from 4 to 12 points 100 by total NH3 from 1e-4 to 1e-1 mol/L points 50 log'

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1]!

export interface WorkerScaling {
  points: number
  /** Median ms from POST to done with one worker, and with two. */
  oneWorkerMs: number
  twoWorkersMs: number
  /** oneWorkerMs / twoWorkersMs. */
  speedup: number
}

export async function workerScaling(source: string, points: number, quiet: boolean, reps = 3): Promise<WorkerScaling> {
  const databaseUrl = await freshBenchDatabase('equipoise_test_bench_jobs', quiet)
  const redisUrl = `redis://127.0.0.1:${redisPort()}/2`
  const redis = new Redis(redisUrl)
  await redis.flushdb()
  redis.disconnect()
  await buildWorker()
  const env = { EQUIPOISE_REDIS_URL: redisUrl }
  const { child, base } = await spawnBuiltServer(databaseUrl, await freePort(), `bench-${Date.now()}-only-for-this-run-xxxxxxxxxxxxxxxx`, env)
  try {
    const cookie = await signInAsDemoEditor(base)
    const headers = { 'content-type': 'application/json', origin: base, cookie }
    const made = await fetch(`${base}/api/labs/demo/systems`, { method: 'POST', headers, body: JSON.stringify({ title: 'Worker bench', slug: 'worker-bench', source }) })
    if (made.status !== 201) throw new Error(`Creating the bench system failed (${made.status})`)
    const runOnce = async (): Promise<number> => {
      const started = performance.now()
      const queued = await fetch(`${base}/api/labs/demo/systems/worker-bench/runs`, { method: 'POST', headers, body: '{}' })
      if (queued.status !== 201) throw new Error(`Queueing the bench run failed (${queued.status}: ${await queued.text()})`)
      const { id } = await queued.json() as { id: number }
      for (;;) {
        const run = await (await fetch(`${base}/api/labs/demo/systems/worker-bench/runs/${id}`, { headers })).json() as { jobStatus: string, jobError: string | null }
        if (run.jobStatus === 'done') {
          const ms = performance.now() - started
          // Deleted, so the lab's run storage budget never fills during the bench.
          await fetch(`${base}/api/labs/demo/systems/worker-bench/runs/${id}`, { method: 'DELETE', headers })
          return ms
        }
        if (run.jobStatus !== 'queued' && run.jobStatus !== 'running') throw new Error(`The bench run ended ${run.jobStatus}: ${run.jobError}`)
        await new Promise((r) => setTimeout(r, 50))
      }
    }
    const timed = async (workers: number): Promise<number> => {
      const worker = await startWorkerProcess({ ...process.env, NUXT_DATABASE_URL: databaseUrl, EQUIPOISE_REDIS_URL: redisUrl }, process.cwd(), workers)
      try {
        await runOnce() // warm-up: the solver threads' first run
        const times: number[] = []
        for (let k = 0; k < reps; k++) times.push(await runOnce())
        return median(times)
      } finally {
        await worker.stop()
      }
    }
    const oneWorkerMs = await timed(1)
    const twoWorkersMs = await timed(2)
    return { points, oneWorkerMs, twoWorkersMs, speedup: oneWorkerMs / twoWorkersMs }
  } finally {
    child.kill()
  }
}

if (process.argv[1]?.endsWith('bench/workers.ts')) {
  const { benchSystemSource } = await import('./systems')
  console.log(JSON.stringify(await workerScaling(benchSystemSource(WORKER_BENCH_MAP), 5000, true)))
}
