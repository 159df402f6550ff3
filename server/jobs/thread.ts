/**
 * The solver thread of a worker process: it computes slices and answers of
 * the study kinds (server/jobs/studies.ts) while the process's main thread
 * keeps the job's lock on Redis alive, records progress and watches for a
 * cancel. A cancel (or the slice's time running out) is seen between two
 * points through a shared flag, so the slice ends within one point's time.
 */
import type { MessagePort } from 'node:worker_threads'
import type { Model } from '../../shared/poise/model'
import { SOLVE_LIMITS } from '../utils/solve-limits'
import { STUDY_RUNNERS, type Slice, type StoredPart } from './studies'

export type ThreadRequest =
  | { id: number, op: 'slice', kind: string, model: Model, from: number, to: number, sliceMs: number, stop: SharedArrayBuffer }
  | { id: number, op: 'finish', kind: string, model: Model, parts: StoredPart[], complete: boolean }

export type ThreadAnswer =
  | { id: number, type: 'progress', done: number }
  | { id: number, type: 'slice', slice: Slice }
  | { id: number, type: 'finished', resultJson: string | null, failed?: number }
  | { id: number, type: 'error', message: string }

/** How often progress is posted to the main thread while a slice runs. */
const PROGRESS_EVERY_MS = 100

export function serveStudies(port: MessagePort): void {
  const solveOptions = { timeBudgetMs: SOLVE_LIMITS.timeBudgetMs }
  port.on('message', (request: ThreadRequest) => {
    const post = (answer: ThreadAnswer) => port.postMessage(answer)
    try {
      const kind = STUDY_RUNNERS[request.kind]
      if (!kind) throw new Error(`This worker does not know studies of kind "${request.kind}"; update the workers to this version of Equipoise.`)
      if (request.op === 'slice') {
        const stop = new Int32Array(request.stop)
        const started = performance.now()
        let posted = started
        const slice = kind.run(request.model, request.from, request.to, {
          solveOptions,
          progress(done) {
            const now = performance.now()
            if (now - posted >= PROGRESS_EVERY_MS) {
              posted = now
              post({ id: request.id, type: 'progress', done })
            }
          },
          shouldStop: () => Atomics.load(stop, 0) !== 0 || performance.now() - started >= request.sliceMs,
        })
        post({ id: request.id, type: 'slice', slice })
      } else {
        const resultJson = kind.finish(request.model, request.parts, request.complete, solveOptions)
        const failed = resultJson !== null && kind.failedOf ? kind.failedOf(request.model, resultJson) : undefined
        post({ id: request.id, type: 'finished', resultJson, ...(failed === undefined ? {} : { failed }) })
      }
    } catch (error) {
      post({ id: request.id, type: 'error', message: error instanceof Error ? error.message : String(error) })
    }
  })
}
