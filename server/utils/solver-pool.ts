/**
 * The solver runs in a pool of worker threads so that a long sweep never
 * blocks the event loop that serves everybody's pages. Solves are admitted
 * by a SolveQueue (solve-queue.ts): one running solve per pool thread, at
 * most `solvesPerUser` per account (429 beyond), waiting solves started in
 * turn across accounts. Every task has a time limit that starts when the
 * task is handed to a free thread, so waiting in the queue does not count;
 * a task over it is aborted (its thread is replaced) and the caller gets a
 * clear message.
 */
import { existsSync } from 'node:fs'
import { availableParallelism } from 'node:os'
import { dirname, join } from 'node:path'
import { pathToFileURL } from 'node:url'
import Piscina from 'piscina'
import type { Model } from '../../shared/poise/model'
import type { AnswerForm, FitTask, SolveTask, SolveTaskAnswer, SolveTaskOutput } from '../workers/solve.worker'
import type { FitOutcome } from '../../shared/types/fit'
import { SOLVE_LIMITS } from './solve-limits'
import { SolveQueue, SolveQueueRefusal } from './solve-queue'

let pool: Piscina | null = null
let queue: SolveQueue | null = null

const THREADS = Math.max(1, Math.min(4, availableParallelism() - 1))

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
    pool = new Piscina({
      filename: pathToFileURL(workerPath()).href,
      minThreads: 1,
      maxThreads: THREADS,
      idleTimeout: 60_000,
    })
  }
  return pool
}

/** Solves each account may have running or waiting at once (NUXT_SOLVES_PER_USER). */
export function solvesPerUser(): number {
  const n = Math.floor(Number(useRuntimeConfig().solvesPerUser))
  return Number.isFinite(n) && n >= 1 ? n : 1
}

function getQueue(): SolveQueue {
  if (!queue) queue = new SolveQueue({ slots: THREADS, perUser: solvesPerUser(), maxWaiting: SOLVE_LIMITS.maxQueuedTasks })
  return queue
}

/**
 * Solve a compiled model in the pool for an account; throws an h3 error with a readable message on a limit, timeout or overload.
 * `form` `columns` answers a sweep by columns (see AnswerForm); other answers are JSON either way.
 */
export async function solveInPool(model: Model, userId: number, form: AnswerForm = 'points'): Promise<SolveTaskOutput> {
  const task: SolveTask = { model, timeBudgetMs: SOLVE_LIMITS.timeBudgetMs, form }
  try {
    return await getQueue().run(userId, async () => {
      // Handed to a free thread now: the limit counts solving time only.
      const signal = AbortSignal.timeout(SOLVE_LIMITS.timeBudgetMs + SOLVE_LIMITS.graceMs)
      return withResultText(await getPool().run(task, { signal }) as SolveTaskAnswer)
    })
  } catch (error) {
    if (error instanceof SolveQueueRefusal) {
      if (error.reason === 'per-user') {
        throw createError({ statusCode: 429, message: error.message, data: { solvesPerUser: getQueue().perUser } })
      }
      throw createError({ statusCode: 503, message: error.message })
    }
    const name = (error as { name?: string } | null)?.name
    if (name === 'AbortError' || name === 'TimeoutError') {
      throw createError({ statusCode: 422, message: `The solve took longer than ${SOLVE_LIMITS.timeBudgetMs / 1000} s of solving time and was stopped. Use fewer sweep points or a smaller system.` })
    }
    if ((error as { statusCode?: number }).statusCode) throw error
    console.error('[solver-pool]', error)
    throw createError({ statusCode: 500, message: 'The solver failed unexpectedly on this system. The text was not changed; please report it with the file.' })
  }
}

/**
 * Fit a data set in the pool for an account, admitted like a solve (it
 * counts against the same per-account limit); the time limit is
 * SOLVE_LIMITS.fitTimeBudgetMs, inside which the fit stops on its own.
 */
export async function fitInPool(task: Omit<FitTask, 'timeBudgetMs'>, userId: number): Promise<FitOutcome> {
  const full: FitTask = { ...task, timeBudgetMs: SOLVE_LIMITS.fitTimeBudgetMs }
  try {
    return await getQueue().run(userId, async () => {
      const signal = AbortSignal.timeout(SOLVE_LIMITS.fitTimeBudgetMs + SOLVE_LIMITS.graceMs)
      return await getPool().run(full, { signal, name: 'runFitTask' }) as FitOutcome
    })
  } catch (error) {
    if (error instanceof SolveQueueRefusal) {
      if (error.reason === 'per-user') throw createError({ statusCode: 429, message: error.message, data: { solvesPerUser: getQueue().perUser } })
      throw createError({ statusCode: 503, message: error.message })
    }
    const name = (error as { name?: string } | null)?.name
    if (name === 'AbortError' || name === 'TimeoutError') {
      throw createError({ statusCode: 422, message: `The fit took longer than ${SOLVE_LIMITS.fitTimeBudgetMs / 1000} s and was stopped. Use fewer data points or fit fewer constants.` })
    }
    console.error('[solver-pool] fit', error)
    throw createError({ statusCode: 500, message: 'The fit failed unexpectedly. Nothing was changed; please report it with the file and data set.' })
  }
}

/** The main thread's view of an answer: `resultJson` decodes the bytes on first use (the `points` form only). */
function withResultText(answer: SolveTaskAnswer): SolveTaskOutput {
  let text: string | undefined
  return Object.defineProperty({ ...answer }, 'resultJson', {
    enumerable: false,
    get: () => {
      if (answer.form !== 'points') throw new Error('resultJson of an answer by columns: ask the pool for the points form')
      return (text ??= Buffer.from(answer.resultBytes.buffer, answer.resultBytes.byteOffset, answer.resultBytes.byteLength).toString('utf8'))
    },
  }) as SolveTaskOutput
}
