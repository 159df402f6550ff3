// A long study in the browser: Run shows its progress (points done of total,
// time) with a Cancel button that stops it and keeps what was computed;
// leaving the page does not stop a run, the history shows it and the
// workbench picks it up again on return; a run goes on to its answer.
import { beforeAll, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { pollRun } from '../setup/jobs'
import { openSignedIn, screenshot } from '../setup/browser'
import { longSweep } from '../fixtures/studies'

await useBuiltServer()

let owner: SignedIn
let lab: string
const system = (path = '') => `/api/labs/${lab}/systems/bath${path}`

beforeAll(async () => {
  owner = await signUp('owner')
  lab = await makeLab(owner)
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Bath sweep', slug: 'bath', source: longSweep } })).status).toBe(201)
})

it('shows a long run\'s progress and cancels it, keeping the points computed', async () => {
  const page = await openSignedIn(`/labs/${lab}/systems/bath`, owner.cookie)
  await page.setViewportSize({ width: 1280, height: 900 })
  await page.locator('[data-test=run]').click()
  const job = page.locator('[data-test=job]')
  await job.waitFor()
  // Hold the worker still (SIGSTOP) once it has solved some points, so the run is surely mid-way when Cancel is pressed.
  const runs = (await api(system('/runs'), { cookie: owner.cookie })).body.runs
  const running = (await pollRun(system(`/runs/${runs[0].id}`), owner, (run) => run.progress.done > 0, 20)).at(-1)
  const worker = Number(running.worker.split(':').at(-1))
  process.kill(worker, 'SIGSTOP')
  let answered!: Promise<import('playwright-core').Response>
  try {
    await job.locator('[data-test=job-progress]').getByText(/[1-9][\d,]* of 5,000 points · /).waitFor()
    await expect(job.getByRole('progressbar').getAttribute('aria-valuemax')).resolves.toBe('5000')
    await screenshot(page, 'jobs-progress')
    // The cancel goes out while the worker is held (the answer may wait for a row the held worker has locked).
    answered = page.waitForResponse((answer) => answer.url().endsWith(`/runs/${running.id}/cancel`))
    const asked = page.waitForRequest((request) => request.url().endsWith(`/runs/${running.id}/cancel`))
    await job.locator('[data-test=job-cancel]').click()
    await asked
  } finally {
    process.kill(worker, 'SIGCONT')
  }
  expect((await answered).status()).toBe(200)
  const note = page.locator('[data-test=run-cancelled]')
  await note.waitFor({ timeout: 60_000 })
  const kept = Number((await note.textContent())!.match(/keeps the ([\d,]+) of 5,000 points/)![1]!.replace(/,/g, ''))
  expect(kept).toBeGreaterThan(0)
  expect(kept).toBeLessThan(5000)
  await expect(job.count()).resolves.toBe(0)
  // The point picker walks the points it kept, no more.
  await expect(page.locator('[data-test=results]').textContent()).resolves.toContain(`(1 of ${kept})`)
  await screenshot(page, 'jobs-cancelled')
  await page.close()
}, 120_000)

it('keeps a run going when the page is left, shows it in the history, and shows its answer on return', async () => {
  const page = await openSignedIn(`/labs/${lab}/systems/bath`, owner.cookie)
  await page.locator('[data-test=run]').click()
  await page.locator('[data-test=job]').waitFor()

  await page.goto(new URL(`/labs/${lab}/systems/bath/history`, page.url()).href)
  const list = (await api(system('/runs'), { cookie: owner.cookie })).body.runs
  const newest = list[0]
  await page.locator(`[data-test=run-state-${newest.id}]`).getByText(/queued|running|solved/).waitFor()

  await page.goto(new URL(`/labs/${lab}/systems/bath`, page.url()).href)
  // Back on the workbench: the run on the queue (or, if it ended meanwhile, its answer).
  const note = page.locator('[data-test=run-note]')
  await note.getByText(new RegExp(`Run ${newest.number} of revision 1`)).waitFor({ timeout: 180_000 })
  await expect(page.locator('[data-test=run-cancelled]').count()).resolves.toBe(0)
  const stored = (await api(system(`/runs/${newest.id}`), { cookie: owner.cookie })).body
  expect(stored).toMatchObject({ jobStatus: 'done', status: 'ok', progress: { done: 5000, total: 5000 } })
  await screenshot(page, 'jobs-done')
  await page.close()
}, 240_000)
