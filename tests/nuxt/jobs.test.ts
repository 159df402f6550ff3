// Stored runs as jobs on the study queue (real Redis, real MariaDB, real
// worker processes): queued → running → done with progress that never goes
// back; cancel keeping what was computed; a worker killed with kill -9 whose
// job another worker finishes, stored once; the per-account limit.
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { TEST_DATABASE_URL } from '../setup/test-database'
import { pollRun } from '../setup/jobs'
import { startWorkerProcess, type WorkerProcess } from '../setup/server-process'
import { SOLVE_LIMITS } from '../../server/utils/solve-limits'
import { longSweep, vinegarWith } from '../fixtures/studies'

await useBuiltServer()

let owner: SignedIn, reviewer: SignedIn, other: SignedIn
let lab: string
let db: mysql.Connection
const system = (path = '') => `/api/labs/${lab}/systems/rinse${path}`
const ended = (run: any) => !['queued', 'running'].includes(run.jobStatus)

async function start(who: SignedIn): Promise<any> {
  const queued = await api(system('/runs'), { method: 'POST', cookie: who.cookie, body: {} })
  expect(queued.status, JSON.stringify(queued.body)).toBe(201)
  return queued.body
}

async function partsOf(runId: number): Promise<number> {
  const [rows] = await db.query('SELECT COUNT(*) AS n FROM run_parts WHERE run_id = ?', [runId]) as unknown as [{ n: number }[]]
  return Number(rows[0]!.n)
}

beforeAll(async () => {
  db = await mysql.createConnection(TEST_DATABASE_URL)
  ;[owner, reviewer, other] = await Promise.all([signUp('owner'), signUp('reviewer'), signUp('other')])
  lab = await makeLab(owner, [{ who: reviewer, role: 'reviewer' }, { who: other, role: 'reviewer' }])
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Rinse', slug: 'rinse', source: longSweep } })).status).toBe(201)
})
afterAll(async () => {
  await db?.end()
})

describe('a stored run is a job', () => {
  it('answers at once with the queued run, then goes running → done with progress that never goes back, and stores the answer once', async () => {
    const queued = await start(reviewer)
    expect(queued).toMatchObject({ jobStatus: 'queued', status: null, result: null, kind: 'sweep', revision: 1, jobId: `run-${queued.id}` })
    expect(queued.progress).toEqual({ done: 0, total: 5000, elapsedMs: 0, remainingMs: null })
    expect(queued.queuedAt).not.toBeNull()

    const seen = await pollRun(system(`/runs/${queued.id}`), reviewer)
    const last = seen.at(-1)
    expect(last).toMatchObject({ jobStatus: 'done', status: 'ok', failedPoints: 0, jobError: null })
    // Seen part-way: running with some of the points done and an estimate of the time left.
    const partWay = seen.filter((run) => run.jobStatus === 'running' && run.progress.done > 0 && run.progress.done < 5000)
    expect(partWay.length).toBeGreaterThan(0)
    expect(partWay[0].progress.remainingMs).toBeGreaterThan(0)
    expect(partWay[0].worker).toMatch(/^.+:\d+$/)
    const done = seen.map((run) => run.progress.done)
    expect(done).toEqual([...done].sort((a, b) => a - b))
    expect(last.progress).toMatchObject({ done: 5000, total: 5000, remainingMs: null })
    expect(new Date(last.startedAt).getTime()).toBeGreaterThanOrEqual(new Date(last.queuedAt).getTime())
    expect(new Date(last.finishedAt).getTime()).toBeGreaterThanOrEqual(new Date(last.startedAt).getTime())

    // Every point, in order, once: the point at index i is the sweep's pH there.
    expect(last.result.values).toHaveLength(5000)
    expect(last.result.points).toHaveLength(5000)
    for (const i of [0, 1, 2, 999, 1000, 2500, 4999]) expect(last.result.points[i].pH).toBeCloseTo(last.result.values[i], 6)
    expect(last.storedBytes).toBe(Buffer.byteLength(JSON.stringify(last.model)) + Buffer.byteLength(JSON.stringify(last.result)))
    expect(await partsOf(queued.id)).toBe(0)
    // Ended: nothing to cancel.
    const late = await api(system(`/runs/${queued.id}/cancel`), { method: 'POST', cookie: reviewer.cookie })
    expect(late.status).toBe(409)
    expect(late.body.message).toBe(`Run ${queued.id} has already ended (done); there is nothing to cancel.`)
  })

  it('cancels a running job, which stops and keeps the points it computed, marked cancelled', async () => {
    // Two long runs share the one worker slice by slice, so the first is still running when it is cancelled.
    const queued = await start(reviewer)
    const beside = await start(other)
    await pollRun(system(`/runs/${queued.id}`), reviewer, (run) => run.progress.done > 0 || ended(run))
    // Someone else (a reviewer who did not start it) may not cancel it.
    const refused = await api(system(`/runs/${queued.id}/cancel`), { method: 'POST', cookie: other.cookie })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/^Only who started run \d+, or a member with the editor role, may cancel it\.$/)
    const asked = await api(system(`/runs/${queued.id}/cancel`), { method: 'POST', cookie: reviewer.cookie })
    expect(asked.status).toBe(200)
    const last = (await pollRun(system(`/runs/${queued.id}`), reviewer)).at(-1)
    expect(last.jobStatus).toBe('cancelled')
    expect(last.progress.done).toBeGreaterThan(0)
    expect(last.progress.done).toBeLessThan(5000)
    // What was computed is kept: the first `done` points of the sweep, with their values.
    expect(last.result.points).toHaveLength(last.progress.done)
    expect(last.result.values).toEqual(last.model.sweep.values.slice(0, last.progress.done))
    expect(last.result.points.at(-1).pH).toBeCloseTo(last.result.values.at(-1), 6)
    expect(await partsOf(queued.id)).toBe(0)
    const list = await api(system('/runs'), { cookie: owner.cookie })
    expect(list.body.runs.find((run: any) => run.id === queued.id)).toMatchObject({ jobStatus: 'cancelled', status: 'ok' })
    // The other run was not disturbed.
    expect((await pollRun(system(`/runs/${beside.id}`), other)).at(-1)).toMatchObject({ jobStatus: 'done', progress: { done: 5000 } })
  })

  it('cancels a queued job at once, before any worker takes it, with nothing computed', async () => {
    const first = await start(owner)
    // Queued behind the first, which holds the worker for at least a slice.
    const second = await start(owner)
    const asked = await api(system(`/runs/${second.id}/cancel`), { method: 'POST', cookie: owner.cookie })
    expect(asked.status).toBe(200)
    expect(asked.body).toMatchObject({ jobStatus: 'cancelled', status: null, progress: { done: 0, total: 5000 } })
    const last = (await pollRun(system(`/runs/${second.id}`), owner)).at(-1)
    expect(last).toMatchObject({ jobStatus: 'cancelled', result: null, status: null, startedAt: null })
    expect((await api(system(`/runs/${first.id}/cancel`), { method: 'POST', cookie: owner.cookie })).status).toBe(200)
    expect(ended((await pollRun(system(`/runs/${first.id}`), owner)).at(-1))).toBe(true)
  })

  it("lets another account's small run through between the slices of a long one", async () => {
    const small = `system "Rinse"\nactivity ideal\ncomponent H+ total 1 mmol/L\ncomponent Cl- total 1 mmol/L\nreaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"\n`
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Small rinse', slug: 'small', source: small } })).status).toBe(201)
    const long = await start(reviewer)
    await pollRun(system(`/runs/${long.id}`), reviewer, (run) => run.jobStatus === 'running' || ended(run))
    const quick = await api(`/api/labs/${lab}/systems/small/runs`, { method: 'POST', cookie: other.cookie, body: {} })
    expect(quick.status).toBe(201)
    const solved = (await pollRun(`/api/labs/${lab}/systems/small/runs/${quick.body.id}`, other)).at(-1)
    expect(solved).toMatchObject({ jobStatus: 'done', status: 'ok', kind: 'single' })
    expect(solved.result.pH).toBeCloseTo(3, 3)
    // One worker: the small run, queued while the long one ran, was done before the long one ended; it waited for a slice, not for the whole sweep.
    const longEnd = (await pollRun(system(`/runs/${long.id}`), reviewer)).at(-1)
    expect(longEnd.jobStatus).toBe('done')
    expect(new Date(solved.queuedAt).getTime()).toBeGreaterThan(new Date(longEnd.startedAt).getTime())
    expect(new Date(solved.finishedAt).getTime()).toBeLessThan(new Date(longEnd.finishedAt).getTime())
  })
})

describe('a worker killed with kill -9', () => {
  let spare: WorkerProcess
  beforeAll(async () => {
    spare = await startWorkerProcess(inject('serverEnv'), process.cwd())
  })
  afterAll(async () => {
    await spare?.stop()
  })

  it('loses nothing: another worker takes the job up from its last stored slice and stores it once', async () => {
    const queued = await start(reviewer)
    const running = (await pollRun(system(`/runs/${queued.id}`), reviewer, (run) => run.progress.done >= 500 || ended(run))).at(-1)
    expect(running.jobStatus).toBe('running')
    const pid = Number(running.worker.split(':').at(-1))
    process.kill(pid, 'SIGKILL')

    const seen = await pollRun(system(`/runs/${queued.id}`), reviewer)
    const last = seen.at(-1)
    expect(last).toMatchObject({ jobStatus: 'done', status: 'ok', failedPoints: 0 })
    expect(Number(last.worker.split(':').at(-1))).not.toBe(pid)
    const done = seen.map((run) => run.progress.done)
    expect(done).toEqual([...done].sort((a, b) => a - b))
    expect(last.result.points).toHaveLength(5000)
    for (const i of [0, 499, 500, 501, 2500, 4999]) expect(last.result.points[i].pH).toBeCloseTo(last.result.values[i], 6)
    expect(await partsOf(queued.id)).toBe(0)
    const [rows] = await db.query('SELECT COUNT(*) AS n FROM runs WHERE id = ? AND job_status = ?', [queued.id, 'done']) as unknown as [{ n: number }[]]
    expect(Number(rows[0]!.n)).toBe(1)
  })
})

describe('a map is a job too', () => {
  const vinegarMap = (x: number, y: number) => vinegarWith(`map pH from 2 to 12 points ${x} by total CH3COO- from 1e-4 to 1e-1 mol/L points ${y} log`)

  it('runs a map on the queue, row ranges shared by the workers, and stores it by columns', async () => {
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Vinegar map', slug: 'vinegar-map', source: vinegarMap(101, 50) } })).status).toBe(201)
    const queued = await api(`/api/labs/${lab}/systems/vinegar-map/runs`, { method: 'POST', cookie: reviewer.cookie, body: {} })
    expect(queued.status).toBe(201)
    expect(queued.body).toMatchObject({ kind: 'map', progress: { done: 0, total: 5050 } })
    const last = (await pollRun(`/api/labs/${lab}/systems/vinegar-map/runs/${queued.body.id}`, reviewer)).at(-1)
    expect(last).toMatchObject({ jobStatus: 'done', status: 'ok', progress: { done: 5050, total: 5050 } })
    expect(last.result).toMatchObject({ format: 'map-columns', cellsDone: 5050, failedCells: 0, cancelled: false })
    expect(last.result.x.values).toHaveLength(101)
    expect(last.result.y.values).toHaveLength(50)
  })

  it('refuses a map of more cells than one run may compute with 422 saying what to change', async () => {
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Huge map', slug: 'huge-map', source: vinegarMap(101, 201) } })).status).toBe(201)
    const refused = await api(`/api/labs/${lab}/systems/huge-map/runs`, { method: 'POST', cookie: reviewer.cookie, body: {} })
    expect(refused.status).toBe(422)
    expect(refused.body.message).toBe(`This map has 20,301 points; one run may compute at most ${SOLVE_LIMITS.maxJobPoints.toLocaleString('en-US')}. Use fewer points or a larger step.`)
    expect((await api(`/api/labs/${lab}/systems/huge-map/runs`, { cookie: owner.cookie })).body.runs).toEqual([])
  })
})

describe('fair use', () => {
  it(`refuses an account's run beyond ${SOLVE_LIMITS.jobsPerUser} queued or running with 429 and Retry-After, while another account still runs`, async () => {
    const mine = [await start(reviewer)]
    // The worker held still (SIGSTOP) while the account fills its limit, so none of its runs ends meanwhile.
    const running = (await pollRun(system(`/runs/${mine[0].id}`), reviewer, (run) => run.jobStatus === 'running' || ended(run), 20)).at(-1)
    expect(running.jobStatus).toBe('running')
    const worker = Number(running.worker.split(':').at(-1))
    process.kill(worker, 'SIGSTOP')
    let theirs
    try {
      while (mine.length < SOLVE_LIMITS.jobsPerUser) mine.push(await start(reviewer))
      const refused = await api(system('/runs'), { method: 'POST', cookie: reviewer.cookie, body: {} })
      expect(refused.status).toBe(429)
      expect(refused.headers.get('retry-after')).toBe(String(SOLVE_LIMITS.jobsRetryAfterSeconds))
      expect(refused.body.message).toMatch(new RegExp(`^You already have ${SOLVE_LIMITS.jobsPerUser} runs queued or running; at most ${SOLVE_LIMITS.jobsPerUser} at a time per account\\. Wait for one to finish or cancel one in the system's history\\. Try again in`))
      theirs = await start(other)
      expect(theirs.jobStatus).toBe('queued')
    } finally {
      process.kill(worker, 'SIGCONT')
    }
    for (const run of mine) expect((await api(system(`/runs/${run.id}/cancel`), { method: 'POST', cookie: reviewer.cookie })).status).toBe(200)
    expect((await api(system(`/runs/${theirs!.id}/cancel`), { method: 'POST', cookie: other.cookie })).status).toBe(200)
    for (const run of [...mine, theirs]) expect(ended((await pollRun(system(`/runs/${run.id}`), owner)).at(-1))).toBe(true)
    // Once they ended, the account runs again.
    const again = await start(reviewer)
    expect((await api(system(`/runs/${again.id}/cancel`), { method: 'POST', cookie: reviewer.cookie })).status).toBe(200)
  })
})
