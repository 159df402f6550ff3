/**
 * Bundles the command line (cli/main.ts with the language and solver it
 * loads) into one file, dist/equipoise.mjs, so it starts without compiling
 * TypeScript. Run by `npm run build:cli`, postinstall, `npm start`, `npm
 * test` and the CLI tests; bin/equipoise.mjs runs the bundle.
 */
import { fileURLToPath } from 'node:url'

const root = fileURLToPath(new URL('..', import.meta.url))

export const CLI_BUNDLE = `${root}dist/equipoise.mjs`

/** Bundles one TypeScript entry with what it imports into one ES module for Node 20 (the CLI, the study worker). */
export async function bundleForNode(entry, outfile) {
  const { build } = await import('esbuild')
  await build({
    entryPoints: [entry],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    // Keep require() of Node's own modules working inside the ES module bundle.
    banner: { js: "import { createRequire as __equipoiseRequire } from 'node:module'; const require = __equipoiseRequire(import.meta.url);" },
    legalComments: 'none',
    minifyWhitespace: true,
    minifySyntax: true,
    logLevel: 'warning',
  })
}

export async function buildCli() {
  await bundleForNode(`${root}cli/main.ts`, CLI_BUNDLE)
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  try {
    await buildCli()
  } catch (error) {
    // An install without dev dependencies has no esbuild: the app still installs, and `equipoise` says how to build it.
    if (process.env.npm_lifecycle_event === 'postinstall' && error?.code === 'ERR_MODULE_NOT_FOUND') {
      console.warn('equipoise: esbuild is not installed, so the command line was not built; install the dev dependencies and run `npm run build:cli`.')
    } else {
      throw error
    }
  }
}
