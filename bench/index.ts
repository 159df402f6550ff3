/**
 * `npm run bench` (`-- --json` for one JSON object): the figures of the
 * solver design's performance table, measured in one run as medians over
 * repetitions. See bench/README.md for what each figure covers.
 */
import { compile } from '../shared/poise/index'
import type { Model } from '../shared/poise/model'
import { solve, solveMap, sweep, SOLVER_VERSION } from '../server/solver/index'
import { newton } from '../server/solver/newton'
import { Workspace, type SolverState } from '../server/solver/workspace'
import { buildProblem } from '../server/solver/problem'
import { PlainNewtonStep } from './plainStep'
import { benchSystemSource, twoHundredLineSource } from './systems'
import { spawnSync } from 'node:child_process'
import { availableParallelism, loadavg, tmpdir } from 'node:os'
import { fileURLToPath } from 'node:url'
import { compileCached } from '../server/utils/compile-cache'
import { toSweepColumns } from '../shared/results/sweep-columns'
import { buildCli } from '../scripts/build-cli.mjs'
import { scalingExponent, scalingSystemSource } from './scaling'
import { hasBuiltServer, startBuiltServer } from './builtServer'
import { httpSweepMs, workbenchMs } from './served'
import { WORKER_BENCH_MAP, workerScaling, type WorkerScaling } from './workers'

import { join } from 'node:path'
import { fitFigures } from './fit'

/** `entry` bundled into one ES module file for a plain `node` (as the server bundles its solver worker); its path. */
async function bundleForNode(entry: string): Promise<string> {
  const { build } = await import('esbuild')
  const outfile = join(tmpdir(), `equipoise-bench-${process.pid}-${entry.replace(/\W+/g, '-')}.mjs`)
  await build({
    entryPoints: [join(root, entry)], outfile, bundle: true, platform: 'node', format: 'esm', target: 'node20', logLevel: 'warning', legalComments: 'none',
    banner: { js: "import { createRequire as __equipoiseRequire } from 'node:module'; const require = __equipoiseRequire(import.meta.url);" },
  })
  return outfile
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

/** Median wall time of fn in ms over `reps` runs, after `warm` unmeasured runs. */
function timeMs(fn: () => void, reps: number, warm = Math.min(reps, 20)): number {
  for (let k = 0; k < warm; k++) fn()
  const t: number[] = []
  for (let k = 0; k < reps; k++) {
    const t0 = performance.now()
    fn()
    t.push(performance.now() - t0)
  }
  return median(t)
}

/** Median per-call time in ms of a fast fn, timed in batches so the clock's resolution does not matter. */
function timeBatchedMs(fn: () => void, batches: number, batch: number): number {
  return timeMs(() => { for (let k = 0; k < batch; k++) fn() }, batches, 5) / batch
}

function compiled(source: string): Model {
  const out = compile(source)
  if (!out.model) throw new Error(`bench system does not compile: ${out.diagnostics.map((d) => d.message).join('; ')}`)
  return out.model
}

/** ns per Math.exp call in a tight loop: shows how loaded the shared machine is during the run. */
function machineCheckNs(): number {
  let acc = 0
  const n = 2_000_000
  const ms = timeMs(() => { for (let k = 0; k < n; k++) acc += Math.exp(-(k & 63) * 0.1) }, 5, 1)
  return acc > 0 ? (ms * 1e6) / n : 0
}

const root = fileURLToPath(new URL('..', import.meta.url))

/** Median wall time in ms of a new Node process running `args` to its end (each one cold: a process of its own). */
function processMs(args: string[], reps: number): number {
  const t: number[] = []
  for (let k = 0; k < reps + 1; k++) {
    const t0 = performance.now()
    const run = spawnSync(process.execPath, args, { cwd: root, stdio: 'ignore' })
    if (run.status !== 0) throw new Error(`node ${args.join(' ')} exited ${run.status}`)
    if (k > 0) t.push(performance.now() - t0)
  }
  return median(t)
}

async function main(json: boolean): Promise<void> {
  // The command line's start-up: the bundle (built from the current source) checking a shipped example, against a bare Node.
  await buildCli()
  const cliCheckMs = processMs(['bin/equipoise.mjs', 'check', 'examples/copper-rinse-tank.poise'], 15)
  const nodeBareMs = processMs(['-e', '0'], 15)
  const cliRatio = cliCheckMs / nodeBareMs

  const longSource = twoHundredLineSource()
  const compileMs = timeMs(() => { compile(longSource) }, 40)

  const model = compiled(benchSystemSource(null))
  const cold = solve(model)
  if (!cold.converged) throw new Error(`bench system did not converge: ${cold.reason}`)
  const solveColdUs = timeBatchedMs(() => { solve(model) }, 31, 20) * 1000

  const sweepModel = compiled(benchSystemSource('sweep pH from 4 to 12 points 1000'))
  let failedPoints = 0
  let sweepIterations = 0
  const sweep1000Ms = timeMs(() => {
    const points = sweep(sweepModel).points
    failedPoints = points.filter((p) => !p.converged).length
    sweepIterations = points.reduce((a, p) => a + p.iterations, 0)
  }, 9, 2)
  const sweepPointUs = (sweep1000Ms / 1000) * 1000

  // A 100 × 50 map against the same cells as 50 sweeps of 100 points (one per row, each into columns): continuation along rows
  // with each row started from the one before should cost what the cells cost as sweep points.
  const mapModel = compiled(benchSystemSource('map pH from 4 to 12 points 100 by total Cu^2+ from 1e-5 to 1e-3 mol/L points 50 log'))
  let mapFailedCells = 0
  const map5000Ms = timeMs(() => { mapFailedCells = solveMap(mapModel, { timeBudgetMs: 60_000 }).failedCells }, 3, 1)
  const rowSweepsMs = timeMs(() => {
    for (const total of mapModel.map!.y.values) {
      const row = { ...mapModel, map: undefined, sweep: { ...mapModel.map!.x }, components: mapModel.components.map((c) => (c.name === 'Cu^2+' ? { ...c, value: total } : c)) }
      // Into columns as the worker answers a sweep, since the map's cells go into columns too.
      toSweepColumns(sweep(row, { timeBudgetMs: 60_000 }))
    }
  }, 3, 1)
  const mapCellToSweepPoint = map5000Ms / rowSweepsMs

  // The same Newton step, ours against a plain typed-array one, from the
  // converged cold solve with every log c nudged by 0.01 (a typical
  // continuation iteration with the solids present).
  const built = buildProblem(model)
  if ('error' in built) throw new Error(built.error)
  const p = built.problem
  const ws = new Workspace(p)
  const base: SolverState = { y: new Float64Array(p.nc), x: new Float64Array(p.nc), n: new Float64Array(p.nsol), active: new Uint8Array(p.nsol), u: Math.sqrt(cold.ionicStrength) }
  model.components.forEach((c, j) => {
    const own = cold.species.find((s) => s.name === c.name)
    base.y[j] = (own?.log10 ?? 0) + 0.01
  })
  model.solids.forEach((s, k) => {
    const r = cold.solids.find((x) => x.name === s.name)!
    base.active[k] = r.present ? 1 : 0
    base.n[k] = r.present ? r.amount * 0.99 : 0
  })
  const work: SolverState = { y: new Float64Array(p.nc), x: new Float64Array(p.nc), n: new Float64Array(p.nsol), active: new Uint8Array(p.nsol), u: 0 }
  const reset = () => { work.y.set(base.y); work.n.set(base.n); work.active.set(base.active); work.u = base.u }
  const limits = { maxIterations: 1, deadline: Infinity }
  const ourStepUs = timeBatchedMs(() => { reset(); newton(ws, work, limits) }, 31, 200) * 1000
  const ours = Float64Array.from(work.y)
  const plain = new PlainNewtonStep(p)
  const plainStepUs = timeBatchedMs(() => { reset(); plain.step(work.y, work.n, work.u, work.active) }, 31, 200) * 1000
  let agree = 0
  for (let j = 0; j < p.nc; j++) agree = Math.max(agree, Math.abs(ours[j] - work.y[j]))
  const ratioToPlain = ourStepUs / plainStepUs
  // A sweep point against the Newton iterations it does (each timed as above).
  const newtonPerPointUs = (sweepIterations / 1000) * ourStepUs
  const sweepPointToNewton = sweepPointUs / newtonPerPointUs

  // Peak RSS of a 20,000-point sweep, solved and encoded as the worker does, in a process of its own
  // running one bundled file as the server's worker does (not tsx, which alone takes ~90 MB).
  const rssBundle = await bundleForNode('bench/sweepRss.ts')
  const rssOf = (form: 'columns' | 'points') => {
    const rss = spawnSync(process.execPath, [rssBundle, form], { cwd: root, encoding: 'utf8' })
    if (rss.status !== 0) throw new Error(`the 20,000-point sweep failed: ${rss.stderr}`)
    return JSON.parse(rss.stdout.trim().split('\n').pop()!) as { peakRssMB: number, startRssMB: number, answerMB: number }
  }
  const rssColumns = rssOf('columns')
  const rssPoints = rssOf('points')
  const sweep20kPeakRssMB = rssColumns.peakRssMB

  // Cost of a sweep point against the number of components, 16 → 256 (4 and 8 shown, not fitted).
  const scaling = [4, 8, 16, 32, 64, 128, 256].map((components) => {
    const points = components >= 128 ? 6 : 20
    const m = compiled(scalingSystemSource(components, points))
    let failed = 0
    const ms = timeMs(() => { failed = sweep(m).points.filter((q) => !q.converged).length }, components >= 128 ? 3 : 5, 1)
    return { components, species: m.species.length, pointUs: (ms / points) * 1000, failed }
  })
  const sweepScalingExponent = scalingExponent(scaling.filter((r) => r.components >= 16))

  // A fit: two pKa to 45 titration points (bench/fit.ts).
  const fit = fitFigures()
  const fitDiproticMs = fit.fitMs

  // Compile of the unchanged 200-line file on a warm server: what a request pays.
  const compileCachedMs = timeMs(() => { compileCached(longSource) }, 40)

  // Through the built server and the browser, when one is built.
  let http: Awaited<ReturnType<typeof httpSweepMs>> | null = null
  let httpPoints: Awaited<ReturnType<typeof httpSweepMs>> | null = null
  let httpToInProcess: number | null = null
  let httpPointsToInProcess: number | null = null
  let workbench: Awaited<ReturnType<typeof workbenchMs>> | null = null
  if (hasBuiltServer() && !process.argv.includes('--no-server')) {
    const server = await startBuiltServer('equipoise_test_bench', json)
    try {
      // The in-process sweep timed again right beside the HTTP one, so both see the same load.
      const inProcessMs = timeMs(() => { sweep(sweepModel) }, 7, 1)
      http = await httpSweepMs(server, 'columns')
      httpPoints = await httpSweepMs(server, 'points')
      httpToInProcess = http.ms / inProcessMs
      httpPointsToInProcess = httpPoints.ms / inProcessMs
      workbench = await workbenchMs(server)
    } finally {
      server.stop()
    }
  }
  // One against two study workers on the same stored 100 × 50 map (queued as ranges of rows the workers share).
  let workers: WorkerScaling | null = null
  if (hasBuiltServer() && !process.argv.includes('--no-server')) workers = await workerScaling(benchSystemSource(WORKER_BENCH_MAP), 5000, json)
  const workerSpeedup = workers?.speedup ?? null
  const workbenchUsableMs = workbench?.usableMs ?? null
  const workbenchFirstResultMs = workbench?.firstResultMs ?? null
  const reportUsableMs = workbench?.reportUsableMs ?? null

  const figures = {
    compileMs, solveColdUs, sweepPointUs, sweep1000Ms, ratioToPlain, cliCheckMs, nodeBareMs, cliRatio,
    sweepPointToNewton, httpToInProcess, sweep20kPeakRssMB, sweepScalingExponent, compileCachedMs, workbenchUsableMs, workbenchFirstResultMs,
    httpPointsToInProcess, sweep20kPointsPeakRssMB: rssPoints.peakRssMB, fitDiproticMs, map5000Ms, mapCellToSweepPoint, reportUsableMs,
    workerSpeedup, oneWorkerMs: workers?.oneWorkerMs ?? null, twoWorkersMs: workers?.twoWorkersMs ?? null,
  }
  if (json) {
    console.log(JSON.stringify(figures))
    return
  }
  const row = (name: string, value: string, target: string, ok: boolean) =>
    `${name.padEnd(44)} ${value.padStart(12)}   target ${target.padEnd(9)} ${ok ? 'met' : 'MISSED'}`
  console.log(`Equipoise solver ${SOLVER_VERSION} benchmark (medians; Node ${process.version})`)
  console.log(`load average ${loadavg().map((x) => x.toFixed(2)).join(' ')} on ${availableParallelism()} cores`)
  console.log(`machine check: ${machineCheckNs().toFixed(1)} ns per Math.exp in a tight loop (lower is a quieter machine)`)
  console.log(`system: ${model.components.length} components, ${model.species.length} species, ${model.solids.length} solids (${cold.solids.filter((s) => s.present).length} present), cold solve ${cold.iterations} iterations`)
  console.log(row('compile a 200-line file', `${compileMs.toFixed(2)} ms`, '< 5 ms', compileMs < 5))
  console.log(row('one solve, cold start', `${solveColdUs.toFixed(0)} µs`, '< 1000 µs', solveColdUs < 1000))
  console.log(row('one sweep point with continuation (mean)', `${sweepPointUs.toFixed(1)} µs`, '< 100 µs', sweepPointUs < 100))
  console.log(row('1,000-point pH sweep, end to end', `${sweep1000Ms.toFixed(1)} ms`, '< 150 ms', sweep1000Ms < 150))
  console.log(row('100 × 50 map / the same cells as 50 sweeps', `${mapCellToSweepPoint.toFixed(2)}×`, '≤ 1.2×', mapCellToSweepPoint <= 1.2))
  console.log(`  (map ${map5000Ms.toFixed(0)} ms, ${mapFailedCells} cells failed; rows as sweeps ${rowSweepsMs.toFixed(0)} ms)`)
  console.log(row('Newton step, ours / plain Float64Array', `${ratioToPlain.toFixed(2)}×`, '≤ 3×', ratioToPlain <= 3))
  console.log(`  (step: ours ${ourStepUs.toFixed(1)} µs, plain ${plainStepUs.toFixed(1)} µs; results agree to ${agree.toExponential(1)} log units; ${failedPoints} sweep points failed)`)
  console.log(row('equipoise check of an example, new process', `${cliCheckMs.toFixed(0)} ms`, '< 300 ms', cliCheckMs < 300))
  console.log(row('  the same / a bare `node -e 0`', `${cliRatio.toFixed(2)}×`, '≤ 4×', cliRatio <= 4))
  console.log(`  (node -e 0: ${nodeBareMs.toFixed(0)} ms)`)
  console.log(row('sweep point / its Newton iterations', `${sweepPointToNewton.toFixed(2)}×`, '≤ 2×', sweepPointToNewton <= 2))
  console.log(`  (${(sweepIterations / 1000).toFixed(2)} iterations per point, ${newtonPerPointUs.toFixed(1)} µs of Newton per point)`)
  console.log(row('peak RSS of a 20,000-point sweep', `${sweep20kPeakRssMB.toFixed(0)} MB`, '< 200 MB', sweep20kPeakRssMB < 200))
  console.log(`  (by columns: ${rssColumns.answerMB.toFixed(0)} MB answer, the process ${rssColumns.startRssMB.toFixed(0)} MB before solving; as points (JSON): peak ${rssPoints.peakRssMB.toFixed(0)} MB, ${rssPoints.answerMB.toFixed(0)} MB answer)`)
  console.log(row('sweep point cost ~ components^k, 16 → 256', `k = ${sweepScalingExponent.toFixed(2)}`, '< 2', sweepScalingExponent < 2))
  for (const r of scaling) console.log(`  ${String(r.components).padStart(4)} components, ${String(r.species).padStart(4)} species: ${r.pointUs.toFixed(0).padStart(8)} µs per point${r.failed ? ` (${r.failed} failed)` : ''}`)
  console.log(row('fit two pKa to 45 titration points', `${fitDiproticMs.toFixed(0)} ms`, '< 2000 ms', fitDiproticMs < 2000))
  console.log(`  (${fit.iterations} Levenberg–Marquardt iterations, each a titration solved at the ${fit.points} volumes per evaluation)`)
  console.log(row('compile the unchanged 200-line file, warm', `${compileCachedMs.toFixed(3)} ms`, '< 0.5 ms', compileCachedMs < 0.5))
  if (httpToInProcess === null || workbench === null) {
    console.log('  (no built server in .output/: run `npm run build` for the HTTP and browser figures)')
  } else {
    console.log(row('1,000-point sweep, HTTP / in process', `${httpToInProcess.toFixed(2)}×`, '≤ 1.5×', httpToInProcess <= 1.5))
    console.log(`  (by columns: HTTP ${http!.ms.toFixed(0)} ms, ${(http!.wireBytes / 1e6).toFixed(2)} MB on the wire; as points (JSON): ${httpPoints!.ms.toFixed(0)} ms, ${httpPointsToInProcess!.toFixed(2)}×, ${(httpPoints!.decodedBytes / 1e6).toFixed(2)} MB of JSON, ${(httpPoints!.wireBytes / 1e6).toFixed(2)} MB on the wire)`)
    console.log(`workbench usable, cold browser (no target)       ${workbench.usableMs.toFixed(0).padStart(8)} ms`)
    console.log(`workbench first result, cold browser (no target) ${workbench.firstResultMs.toFixed(0).padStart(8)} ms`)
    console.log(`report page usable, cold browser (no target)     ${workbench.reportUsableMs.toFixed(0).padStart(8)} ms`)
    console.log(`  (${(workbench.reportTransferredBytes / 1e6).toFixed(2)} MB transferred, ${(workbench.reportDecodedBytes / 1e6).toFixed(2)} MB decoded)`)
    console.log(`  (workbench: ${(workbench.transferredBytes / 1e6).toFixed(2)} MB transferred, ${(workbench.decodedBytes / 1e6).toFixed(2)} MB decoded; the sign-in page ${(workbench.loginTransferredBytes / 1e6).toFixed(2)} MB transferred, ${(workbench.loginDecodedBytes / 1e6).toFixed(2)} MB decoded)`)
  }
  if (workers) {
    console.log(row('stored 100 × 50 map, 1 worker / 2 workers', `${workers.speedup.toFixed(2)}×`, '> 1×', workers.speedup > 1))
    console.log(`  (queued to done: one worker ${workers.oneWorkerMs.toFixed(0)} ms, two workers ${workers.twoWorkersMs.toFixed(0)} ms; ${availableParallelism()} cores)`)
  }
}

await main(process.argv.includes('--json'))
