/**
 * The solver runs in a pool of worker threads so that a long sweep never
 * blocks the event loop that serves everybody's pages. Every task has a time
 * limit; a task over it is aborted (its thread is replaced) and the caller
 * gets a clear message.
 */
import { existsSync } from 'node:fs'
import { availableParallelism } from 'node:os'
import { dirname, join } from 'node:path'
import { pathToFileURL } from 'node:url'
import Piscina from 'piscina'
import type { Model } from '../../shared/poise/model'
import type { SolveTask, SolveTaskAnswer, SolveTaskOutput } from '../workers/solve.worker'
import { SOLVE_LIMITS } from './solve-limits'

let pool: Piscina | null = null

function workerPath(): string {
  const candidates = [
    process.env.NUXT_SOLVER_WORKER,
    useRuntimeConfig().solverWorker as string | undefined,
    process.argv[1] ? join(dirname(process.argv[1]), 'workers/solve.mjs') : undefined,
    join(process.cwd(), '.output/server/workers/solve.mjs'),
    join(process.cwd(), '.nuxt/workers/solve.mjs'),
  ].filter((p): p is string => Boolean(p))
  const found = candidates.find(p => existsSync(p))
  if (!found) {
    throw createError({ statusCode: 503, message: 'The solver is not available: its worker file was not built. Run `npm run build` (or restart `npm run dev`).' })
  }
  return found
}

function getPool(): Piscina {
  if (!pool) {
    const threads = Math.max(1, Math.min(4, availableParallelism() - 1))
    pool = new Piscina({
      filename: pathToFileURL(workerPath()).href,
      minThreads: 1,
      maxThreads: threads,
      idleTimeout: 60_000,
      maxQueue: SOLVE_LIMITS.maxQueuedTasks,
    })
  }
  return pool
}

/** Solve a compiled model in the pool; throws an h3 error with a readable message on timeout or overload. */
export async function solveInPool(model: Model): Promise<SolveTaskOutput> {
  const task: SolveTask = { model, timeBudgetMs: SOLVE_LIMITS.timeBudgetMs }
  const signal = AbortSignal.timeout(SOLVE_LIMITS.timeBudgetMs + SOLVE_LIMITS.graceMs)
  try {
    return withResultText(await getPool().run(task, { signal }) as SolveTaskAnswer)
  } catch (error) {
    const name = (error as { name?: string } | null)?.name
    const message = error instanceof Error ? error.message : String(error)
    if (name === 'AbortError' || name === 'TimeoutError') {
      throw createError({ statusCode: 422, message: `The solve took longer than ${SOLVE_LIMITS.timeBudgetMs / 1000} s and was stopped. Use fewer sweep points or a smaller system.` })
    }
    if (/queue is full/i.test(message)) {
      throw createError({ statusCode: 503, message: 'The solver is busy with other runs. Try again in a few seconds.' })
    }
    if ((error as { statusCode?: number }).statusCode) throw error
    console.error('[solver-pool]', error)
    throw createError({ statusCode: 500, message: 'The solver failed unexpectedly on this system. The text was not changed; please report it with the file.' })
  }
}

/** The main thread's view of an answer: `resultJson` decodes the bytes on first use. */
function withResultText(answer: SolveTaskAnswer): SolveTaskOutput {
  let text: string | undefined
  return Object.defineProperty({ ...answer }, 'resultJson', {
    enumerable: false,
    get: () => (text ??= Buffer.from(answer.resultBytes.buffer, answer.resultBytes.byteOffset, answer.resultBytes.byteLength).toString('utf8')),
  }) as SolveTaskOutput
}
