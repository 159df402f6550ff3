// A stored run is shown from the model it stored: the workbench and the
// printable report show what was solved even when today's compiler would
// make another model of the text, and a run stored before models were says so.
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'
import { TEST_DATABASE_URL } from '../setup/test-database'

await useBuiltServer()

// 1 mmol/L HCl (demo system).
const source = `system "Etch rinse"
activity ideal
component H+ total 1 mmol/L
component Cl- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
`

let owner: SignedIn
let lab: string
let db: mysql.Connection
const base = () => `/api/labs/${lab}/systems/etch`

beforeAll(async () => {
  db = await mysql.createConnection(TEST_DATABASE_URL)
  owner = await signUp('owner')
  lab = await makeLab(owner)
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Etch rinse', slug: 'etch', source } })).status).toBe(201)
})
afterAll(async () => {
  await db?.end()
})

it('shows a stored run with its stored model and compiler version in the workbench and the report', async () => {
  const run = await storeRunToEnd(`${base()}/runs`, { cookie: owner.cookie, body: {} })
  expect(run.status).toBe(201)
  // As if an older compiler had made it: another temperature and pKw than today's compile of the same text.
  const older = structuredClone(run.body.model)
  older.temperatureC = 20
  older.reactions[0].value = 14.17
  await db.query('UPDATE runs SET model = ?, compiler_version = ? WHERE id = ?', [JSON.stringify(older), '0.9.0', run.body.id])

  const page = await openSignedIn(`/labs/${lab}/systems/etch`, owner.cookie)
  await page.setViewportSize({ width: 1280, height: 900 })
  await page.locator('[data-test=run-note]').getByText(/compiler 0\.9\.0/).waitFor()
  await page.getByRole('tab', { name: 'Report' }).click()
  await page.getByText('20.0 °C').first().waitFor()
  await expect(page.locator('[data-test=results]').textContent()).resolves.toContain('14.17')
  await screenshot(page, 'run-stored-model-workbench')

  await page.goto(new URL(`/labs/${lab}/systems/etch/report?run=${run.body.id}`, page.url()).href)
  await page.locator('[data-test=report-compiler]').getByText('version 0.9.0; the model below is the one stored with the run').waitFor()
  const report = await page.locator('[data-test=report]').textContent()
  expect(report).toContain('20.0 °C')
  expect(report).toContain('14.17')
  await expect(page.locator('[data-test=report-recompiled]').count()).resolves.toBe(0)
  await page.close()
})

it('says a run stored before models were shows a recompile of its text', async () => {
  const run = await storeRunToEnd(`${base()}/runs`, { cookie: owner.cookie, body: {} })
  await db.query('UPDATE runs SET model = NULL, compiler_version = NULL, stored_bytes = NULL WHERE id = ?', [run.body.id])

  const page = await openSignedIn(`/labs/${lab}/systems/etch`, owner.cookie)
  await page.setViewportSize({ width: 1280, height: 900 })
  await page.locator('[data-test=run-recompiled]').getByText(/stored before runs kept their model/).waitFor()
  await screenshot(page, 'run-predates-stored-models')

  await page.goto(new URL(`/labs/${lab}/systems/etch/report?run=${run.body.id}`, page.url()).href)
  await page.locator('[data-test=report-recompiled]').getByText(/stored before runs kept their model/).waitFor()
  await expect(page.locator('[data-test=report-compiler]').textContent()).resolves.toBe('not recorded (the run predates stored models)')
  await page.close()
})

it('lists the stored runs with the lab\'s run storage in the history, and lets the owner delete one', async () => {
  const other = await makeLab(owner)
  const path = `/api/labs/${other}/systems/etch`
  expect((await api(`/api/labs/${other}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Etch rinse', slug: 'etch', source } })).status).toBe(201)
  const older = await storeRunToEnd(`${path}/runs`, { cookie: owner.cookie, body: {} })
  await db.query('UPDATE runs SET model = NULL, compiler_version = NULL, stored_bytes = NULL WHERE id = ?', [older.body.id])
  const newer = await storeRunToEnd(`${path}/runs`, { cookie: owner.cookie, body: {} })

  const page = await openSignedIn(`/labs/${other}/systems/etch/history`, owner.cookie)
  await page.setViewportSize({ width: 1280, height: 900 })
  const list = page.locator('[data-test=runs-list]')
  await list.locator('[data-test=run-storage]').getByText(/This lab's stored runs use [\d.]+ KB of its 250 MB run storage budget\./).waitFor()
  await expect(list.locator('tbody tr').count()).resolves.toBe(2)
  await list.locator(`tr[data-run="${older.body.id}"]`).getByText('stored before runs kept their model').waitFor()
  await screenshot(page, 'history-stored-runs')
  page.once('dialog', (dialog) => void dialog.accept())
  await list.locator(`[data-test=delete-run-${older.body.id}]`).click()
  await page.getByRole('status').getByText(`Run ${older.body.number} deleted.`).waitFor()
  await list.locator(`tr[data-run="${older.body.id}"]`).waitFor({ state: 'detached' })
  await expect(list.locator('tbody tr').count()).resolves.toBe(1)
  expect((await api(`${path}/runs`, { cookie: owner.cookie })).body.runs.map((r: { id: number }) => r.id)).toEqual([newer.body.id])
  await page.close()
})
