/**
 * Bundles the study worker (server/jobs/worker.ts with the solver, the
 * database code, BullMQ and ioredis) into one file, dist/worker.mjs, so a
 * worker starts in a fraction of a second without compiling TypeScript.
 * Run by postinstall, `npm start`, `npm test`, `npm run build:worker`, the
 * tests' global setup and `npm run dev` (which bundles it afresh); the bundle is also the entry of the worker's solver thread.
 */
import { fileURLToPath } from 'node:url'
import { bundleForNode } from './build-cli.mjs'

const root = fileURLToPath(new URL('..', import.meta.url))

export const WORKER_BUNDLE = `${root}dist/worker.mjs`

export async function buildWorker() {
  await bundleForNode(`${root}server/jobs/worker.ts`, WORKER_BUNDLE)
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  try {
    await buildWorker()
  } catch (error) {
    // An install without dev dependencies has no esbuild: the app still installs; build the worker where esbuild is.
    if (process.env.npm_lifecycle_event === 'postinstall' && error?.code === 'ERR_MODULE_NOT_FOUND') {
      console.warn('equipoise: esbuild is not installed, so the study worker was not built; install the dev dependencies and run `npm run build:worker`.')
    } else {
      throw error
    }
  }
}
