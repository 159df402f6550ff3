// A Monte Carlo run (`uncertainty draws N`) stored through the study queue
// (real Redis, MariaDB and worker): its progress counts draws and never goes
// back, its bands are the ones the same file gives as a preview (the draws
// made in slices take the same deviates as at once), and a cancel keeps the
// draws made, which the answer says.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { pollRun } from '../setup/jobs'
import { longSweep } from '../fixtures/studies'

await useBuiltServer()

let owner: SignedIn
let lab: string
const runs = (slug: string, path = '') => `/api/labs/${lab}/systems/${slug}/runs${path}`

// Acetic acid, pKa 4.76 (handbook value, from memory) with an uncertainty of our own for the draws.
const vinegar = `system "Vinegar bands"
activity davies
component H+ pH 4
component CH3COO- total 10 mmol/L
component Na+ total 10 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 ± 0.05 cite "acetic acid (from memory)"
sweep pH from 3 to 7 points 9
uncertainty draws 300 seed 7
`
// The long bath of the queue's tests, its ammine constants drawn: 2000 draws of 20 points.
const bath = longSweep
  .replace('logbeta 2.72', 'logbeta 2.72 ± 0.1')
  .replace('logbeta 5.4', 'logbeta 5.4 ± 0.2')
  .replace(/sweep pH from 2 to 12 points \d+/, 'sweep pH from 6 to 11 points 20\nuncertainty draws 2000 seed 3')

async function start(slug: string): Promise<any> {
  const queued = await api(runs(slug), { method: 'POST', cookie: owner.cookie, body: {} })
  expect(queued.status, JSON.stringify(queued.body)).toBe(201)
  return queued.body
}

beforeAll(async () => {
  owner = await signUp('drawer')
  lab = await makeLab(owner)
  for (const [slug, source] of [['vinegar', vinegar], ['bath', bath]] as const) {
    const created = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: slug, slug, source } })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
  }
})

describe('a Monte Carlo run on the study queue', () => {
  it('counts its draws as progress that never goes back, and stores the sweep with the bands its preview gives', async () => {
    const queued = await start('vinegar')
    expect(queued).toMatchObject({ jobStatus: 'queued', kind: 'sweep' })
    expect(queued.progress).toEqual({ done: 0, total: 300, elapsedMs: 0, remainingMs: null, unit: 'draws' })
    const seen = await pollRun(runs('vinegar', `/${queued.id}`), owner, undefined, 20)
    const last = seen.at(-1)
    expect(last).toMatchObject({ jobStatus: 'done', status: 'ok', kind: 'sweep', progress: { done: 300, total: 300, unit: 'draws' } })
    const done = seen.map((run) => run.progress.done)
    expect(done).toEqual([...done].sort((a, b) => a - b))

    // The stored answer is a sweep as before, each point with its band; the same as the preview's, draw for draw.
    const preview = await api(`/api/labs/${lab}/solve`, { method: 'POST', cookie: owner.cookie, body: { source: vinegar } })
    expect(preview.status).toBe(200)
    expect(last.result.values).toEqual([3, 3.5, 4, 4.5, 5, 5.5, 6, 6.5, 7])
    expect(last.result.points).toHaveLength(9)
    for (const i of [0, 3, 8]) {
      const stored = last.result.points[i]
      expect(stored.pH).toBeCloseTo(last.result.values[i], 9)
      expect(stored.uncertainty).toMatchObject({ method: 'monte-carlo', samples: 300, seed: 7, failed: 0 })
      expect(stored.uncertainty.note).toBeUndefined()
      const acid = (p: any) => p.species.find((s: any) => s.name === 'CH3COOH').log10Uncertainty
      expect(acid(stored).high).toBeGreaterThan(acid(stored).low)
      for (const key of ['median', 'low', 'high'] as const) expect(acid(stored)[key]).toBeCloseTo(acid(preview.body.result.points[i])[key], 9)
    }
  })

  it('cancels part-way: the sweep is stored with bands from the draws made, and says so', async () => {
    const queued = await start('bath')
    expect(queued.progress).toMatchObject({ total: 2000, unit: 'draws' })
    await pollRun(runs('bath', `/${queued.id}`), owner, (run) => run.progress.done > 0 || !['queued', 'running'].includes(run.jobStatus), 20)
    const asked = await api(runs('bath', `/${queued.id}/cancel`), { method: 'POST', cookie: owner.cookie })
    expect(asked.status).toBe(200)
    const last = (await pollRun(runs('bath', `/${queued.id}`), owner)).at(-1)
    expect(last).toMatchObject({ jobStatus: 'cancelled', status: 'ok', kind: 'sweep' })
    const made = last.progress.done
    expect(made).toBeGreaterThan(0)
    expect(made).toBeLessThan(2000)
    // The whole sweep, every point with the bands of the draws made.
    expect(last.result.points).toHaveLength(20)
    const summary = last.result.points[10].uncertainty
    expect(summary).toMatchObject({ method: 'monte-carlo', samples: made, seed: 3 })
    expect(summary.note).toBe(`${made} of 2000 draws were made before the run was cancelled: the bands rest on fewer draws than asked.`)
  })
})
