/**
 * Load check (a benchmark, not a test): do page and API requests still answer
 * quickly while long sweeps occupy the solver pool?
 *
 *   npm run build && npm run -s bench:load [-- --json]
 *
 * It starts the private MariaDB, fills the database equipoise_test_load with
 * the migrations and the demo seed, starts the BUILT server (.output) on a free
 * port, signs in as the demo editor, then times GET /api/me and the lab page,
 * first on an idle server and then while it keeps several long pH sweeps of
 * the benchmark system running through POST /api/solve. Figures are medians
 * and 95th percentiles measured in this one run, and the ratio loaded / idle.
 * LOAD_ENCODING sets the sweeps' Accept-Encoding (default `gzip, deflate, br`;
 * `identity` for uncompressed answers).
 */
import { DEMO_LAB } from '../server/database/seed'
import { hasBuiltServer, startBuiltServer } from './builtServer'
import { benchSystemSource } from './systems'

const asJson = process.argv.includes('--json')
const DATABASE = 'equipoise_test_load'
const SWEEP_POINTS = 3000
const SWEEPS_IN_FLIGHT = 3
const PROBES = 40

function say(line: string) { if (!asJson) console.log(line) }

function quantile(values: number[], q: number): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN
}

async function timed(url: string, cookie: string): Promise<number> {
  const started = performance.now()
  const answer = await fetch(url, { headers: { cookie } })
  await answer.arrayBuffer()
  if (!answer.ok) throw new Error(`${url} answered ${answer.status}`)
  return performance.now() - started
}

async function probe(base: string, cookie: string): Promise<{ api: number[], page: number[] }> {
  const api: number[] = []
  const page: number[] = []
  for (let i = 0; i < PROBES; i++) {
    api.push(await timed(`${base}/api/me`, cookie))
    page.push(await timed(`${base}/labs/${DEMO_LAB.slug}`, cookie))
    await new Promise(r => setTimeout(r, 25))
  }
  return { api, page }
}

async function main() {
  if (!hasBuiltServer()) {
    console.error('No built server in .output/: run `npm run build` first, then `npm run -s bench:load`.')
    process.exit(2)
  }
  const { base, cookie, stop } = await startBuiltServer(DATABASE, asJson)
  try {
    await probe(base, cookie) // warm-up: first renders compile templates and open DB connections
    const idle = await probe(base, cookie)

    const source = benchSystemSource(`sweep pH from 4 to 12 points ${SWEEP_POINTS}`)
    let loading = true
    let sweepsDone = 0
    const sweepMs: number[] = []
    const runner = async () => {
      while (loading) {
        const started = performance.now()
        const answer = await fetch(`${base}/api/solve`, { method: 'POST', headers: { 'content-type': 'application/json', cookie, 'accept-encoding': process.env.LOAD_ENCODING ?? 'gzip, deflate, br' }, body: JSON.stringify({ source }) })
        await answer.arrayBuffer()
        if (!answer.ok) throw new Error(`a sweep answered ${answer.status}`)
        sweepMs.push(performance.now() - started)
        sweepsDone++
      }
    }
    const runners = Array.from({ length: SWEEPS_IN_FLIGHT }, runner)
    await new Promise(r => setTimeout(r, 500)) // let the pool fill
    const loaded = await probe(base, cookie)
    loading = false
    await Promise.all(runners)

    const figures = {
      sweepPoints: SWEEP_POINTS,
      sweepsInFlight: SWEEPS_IN_FLIGHT,
      sweepsDone,
      sweepMedianMs: Math.round(quantile(sweepMs, 0.5)),
      apiIdleMedianMs: +quantile(idle.api, 0.5).toFixed(1),
      apiLoadedMedianMs: +quantile(loaded.api, 0.5).toFixed(1),
      apiLoadedP95Ms: +quantile(loaded.api, 0.95).toFixed(1),
      pageIdleMedianMs: +quantile(idle.page, 0.5).toFixed(1),
      pageLoadedMedianMs: +quantile(loaded.page, 0.5).toFixed(1),
      pageLoadedP95Ms: +quantile(loaded.page, 0.95).toFixed(1),
      apiRatio: +(quantile(loaded.api, 0.5) / quantile(idle.api, 0.5)).toFixed(2),
      pageRatio: +(quantile(loaded.page, 0.5) / quantile(idle.page, 0.5)).toFixed(2),
    }
    if (asJson) {
      console.log(JSON.stringify(figures))
    } else {
      say(`\nLoad check: ${SWEEPS_IN_FLIGHT} sweeps of ${SWEEP_POINTS} points kept running (${sweepsDone} done, median ${figures.sweepMedianMs} ms each)`)
      say(`  GET /api/me        idle median ${figures.apiIdleMedianMs} ms   loaded median ${figures.apiLoadedMedianMs} ms, p95 ${figures.apiLoadedP95Ms} ms   ratio ${figures.apiRatio}×`)
      say(`  GET /labs/${DEMO_LAB.slug} (SSR) idle median ${figures.pageIdleMedianMs} ms   loaded median ${figures.pageLoadedMedianMs} ms, p95 ${figures.pageLoadedP95Ms} ms   ratio ${figures.pageRatio}×`)
      say('  (one run on this machine; the sweeps run in the worker pool, the requests on the main event loop)')
    }
  } finally {
    stop()
  }
}

main().catch((error) => {
  const cause = (error as { cause?: unknown })?.cause
  console.error(`Load check failed: ${error instanceof Error ? error.message : String(error)}${cause ? ` (${String(cause)})` : ''}`)
  process.exit(1)
})
