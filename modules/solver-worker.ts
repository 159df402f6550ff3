/**
 * Bundles the solver's worker-thread entry into one self-contained ESM file.
 *
 * Nitro bundles route handlers but not a file that only a worker thread loads,
 * so the pool would find nothing in `.output/`. This module builds
 * `server/workers/solve.worker.ts` (compiler + solver + ml-matrix) with esbuild
 * next to the built server (`.output/server/workers/solve.mjs`) and, in
 * development, into `.nuxt/workers/solve.mjs`, rebuilt when solver or
 * language sources change.
 */
import { join, resolve } from 'node:path'
import { build } from 'esbuild'
import { defineNuxtModule } from 'nuxt/kit'

export const WORKER_FILE = 'workers/solve.mjs'

export default defineNuxtModule({
  meta: { name: 'equipoise-solver-worker' },
  setup(_options, nuxt) {
    const entry = resolve(nuxt.options.rootDir, 'server/workers/solve.worker.ts')
    const bundle = (outfile: string) => build({
      entryPoints: [entry],
      outfile,
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      logLevel: 'warning',
      legalComments: 'none',
      // The pool's own piscina (Piscina.move marks the answer with its symbol).
      external: ['piscina'],
    })

    if (nuxt.options.dev) {
      const devOut = join(nuxt.options.buildDir, WORKER_FILE)
      nuxt.options.runtimeConfig.solverWorker = devOut
      nuxt.hook('ready', async () => { await bundle(devOut) })
      nuxt.hook('builder:watch', async (_event, path) => {
        if (/(^|\/)(server\/solver|server\/workers|shared\/poise)\//.test(path)) await bundle(devOut)
      })
      return
    }

    nuxt.hook('nitro:init', (nitro) => {
      nitro.hooks.hook('compiled', async () => {
        await bundle(join(nitro.options.output.serverDir, WORKER_FILE))
      })
    })
  },
})
