// A Monte Carlo run in the browser: its progress counts draws, Cancel stops
// it between two draws, and the workbench then shows the whole study with
// bands from the draws made, saying how many.
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
// The queue tests' bath with two ammine constants drawn (uncertainties of our own): 2000 draws of a 20-point sweep.
const bath = longSweep
  .replace('logbeta 2.72', 'logbeta 2.72 ± 0.1')
  .replace('logbeta 5.4', 'logbeta 5.4 ± 0.2')
  .replace(/sweep pH from 2 to 12 points \d+/, 'sweep pH from 6 to 11 points 20\nuncertainty draws 2000 seed 3')

beforeAll(async () => {
  owner = await signUp('owner')
  lab = await makeLab(owner)
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Bath bands', slug: 'bath', source: bath } })).status).toBe(201)
})

it('shows a Monte Carlo run\'s draws as its progress and, cancelled, the study with the bands of the draws made', async () => {
  const page = await openSignedIn(`/labs/${lab}/systems/bath`, owner.cookie)
  await page.setViewportSize({ width: 1280, height: 900 })
  // No run is stored yet, so the page first solves a preview, draws and all; Run is free once it is shown.
  await page.locator('[data-test=preview-label]').waitFor({ timeout: 60_000 })
  await page.locator('[data-test=run]').click()
  const job = page.locator('[data-test=job]')
  await job.waitFor()
  // Hold the worker still (SIGSTOP) once it has made some draws, so the run is surely mid-way when Cancel is pressed.
  const runs = (await api(system('/runs'), { cookie: owner.cookie })).body.runs
  const running = (await pollRun(system(`/runs/${runs[0].id}`), owner, (run) => run.progress.done > 0, 20)).at(-1)
  const worker = Number(running.worker.split(':').at(-1))
  process.kill(worker, 'SIGSTOP')
  let answered!: Promise<import('playwright-core').Response>
  try {
    await job.locator('[data-test=job-progress]').getByText(/[1-9][\d,]* of 2,000 draws · /).waitFor()
    await expect(job.getByRole('progressbar').getAttribute('aria-label')).resolves.toBe('Draws made')
    await screenshot(page, 'montecarlo-job-progress')
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
  const made = Number((await note.textContent())!.match(/Cancelled after ([\d,]+) of 2,000 draws: the whole study is shown/)![1]!.replace(/,/g, ''))
  expect(made).toBeGreaterThan(0)
  expect(made).toBeLessThan(2000)
  // Every point of the sweep is there, not only as many as the draws made.
  await expect(page.locator('[data-test=results]').textContent()).resolves.toContain('(1 of 20)')
  await screenshot(page, 'montecarlo-job-cancelled')
  await page.close()
}, 120_000)
