// Limits that keep one account from filling the disk or the solver: the
// per-lab run storage budget (and deleting runs to free it), and the
// per-account limit on solves at once.
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { TEST_DATABASE_URL } from '../setup/test-database'

await useBuiltServer()

// 1 mmol/L HCl (demo system).
const strongAcid = `system "Pickling rinse"
activity ideal
component H+ total 1 mmol/L
component Cl- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
`
// The same across the largest sweep allowed, so a solve takes a while (demo values).
const longSweep = strongAcid.replace('component H+ total 1 mmol/L', 'component H+ pH 7') + 'sweep pH from 2 to 12 points 5000\n'

let owner: SignedIn, editor: SignedIn, reviewer: SignedIn, viewer: SignedIn
let lab: string
let db: mysql.Connection
const system = (path = '') => `/api/labs/${lab}/systems/rinse${path}`
const BUDGET = 250_000_000

beforeAll(async () => {
  db = await mysql.createConnection(TEST_DATABASE_URL)
  ;[owner, editor, reviewer, viewer] = await Promise.all([signUp('owner'), signUp('editor'), signUp('reviewer'), signUp('viewer')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: reviewer, role: 'reviewer' }, { who: viewer, role: 'viewer' }])
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Rinse', slug: 'rinse', source: strongAcid } })).status).toBe(201)
})
afterAll(async () => {
  await db?.end()
})

describe('run storage budget', () => {
  it('refuses a run with 409 saying the budget, the use and what to do; deleting runs (editors) frees it', async () => {
    const first = await storeRunToEnd(system('/runs'), { cookie: reviewer.cookie, body: {} })
    expect(first.status).toBe(201)
    // Another run that fills the budget, as if a huge sweep had been stored.
    const filler = BUDGET - first.body.storedBytes - 10
    const [revision] = (await db.query('SELECT revision_id FROM runs WHERE id = ?', [first.body.id]))[0] as { revision_id: number }[]
    const [inserted] = await db.query(
      'INSERT INTO runs (revision_id, solver_version, compiler_version, options, model, result, stored_bytes, status, timing_ms) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
      [revision!.revision_id, first.body.solverVersion, first.body.compilerVersion, '{"kind":"single"}', JSON.stringify(first.body.model), JSON.stringify(first.body.result), filler, 'ok', 1],
    ) as unknown as [{ insertId: number }]
    const count = async () => (await api(system('/runs'), { cookie: owner.cookie })).body.runs.length

    // 10 bytes left: the run is solved but does not fit.
    const refused = await storeRunToEnd(system('/runs'), { cookie: reviewer.cookie, body: {} })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/^This lab's stored runs use 250 MB of its 250 MB run storage budget, and this run needs \d+(\.\d)? KB more\. Delete old runs/)
    expect(refused.body.data).toMatchObject({ usedBytes: BUDGET - 10, budgetBytes: BUDGET })
    expect(await count()).toBe(2)
    const listed = await api(system('/runs'), { cookie: viewer.cookie })
    expect(listed.body.storage).toEqual({ usedBytes: BUDGET - 10, budgetBytes: BUDGET })

    // A preview is never stored, so it still works.
    expect((await api(`/api/labs/${lab}/solve`, { method: 'POST', cookie: viewer.cookie, body: { source: strongAcid } })).status).toBe(200)

    // Only editors and up delete runs.
    const notAllowed = await api(system(`/runs/${inserted.insertId}`), { method: 'DELETE', cookie: reviewer.cookie })
    expect(notAllowed.status).toBe(403)
    expect(notAllowed.body.message).toMatch(/needs the editor role/)
    const deleted = await api(system(`/runs/${inserted.insertId}`), { method: 'DELETE', cookie: editor.cookie })
    expect(deleted.status).toBe(200)
    expect(deleted.body).toEqual({ deleted: inserted.insertId, storage: { usedBytes: first.body.storedBytes, budgetBytes: BUDGET } })
    const [audit] = await db.query("SELECT detail FROM audit_log WHERE action = 'run.delete' AND actor_id = ?", [editor.user.id]) as unknown as [{ detail: string }[]]
    expect(JSON.parse(audit[0]!.detail)).toMatchObject({ system: 'rinse', run: inserted.insertId, revision: 1 })
    expect((await api(system(`/runs/${inserted.insertId}`), { method: 'DELETE', cookie: editor.cookie })).status).toBe(404)

    expect((await storeRunToEnd(system('/runs'), { cookie: reviewer.cookie, body: {} })).status).toBe(201)
    expect(await count()).toBe(2)
  })

  it('refuses before solving when the budget is already spent', async () => {
    const [revision] = (await db.query('SELECT r.id FROM revisions r JOIN systems s ON s.id = r.system_id JOIN labs l ON l.id = s.lab_id WHERE l.slug = ?', [lab]))[0] as { id: number }[]
    await db.query('INSERT INTO runs (revision_id, solver_version, options, result, stored_bytes, status, timing_ms) VALUES (?, ?, ?, ?, ?, ?, ?)', [revision!.id, '1.0.0', '{}', 'null', BUDGET, 'ok', 1])
    const refused = await storeRunToEnd(system('/runs'), { cookie: editor.cookie, body: {} })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/^This lab's stored runs use 250 MB of its 250 MB run storage budget\. Delete old runs/)
    expect(refused.body.data.neededBytes).toBeNull()
  })
})

describe('solves at once per account', () => {
  it('answers 429 naming the limit beyond two solves at once, while another account still solves', async () => {
    const solve = (who: SignedIn, source: string) => api(`/api/labs/${lab}/solve`, { method: 'POST', cookie: who.cookie, body: { source } })
    const mine = Array.from({ length: 5 }, () => solve(viewer, longSweep))
    const theirs = solve(editor, strongAcid)
    const answers = await Promise.all(mine)
    const statuses = answers.map((a) => a.status).sort()
    expect(statuses).toEqual([200, 200, 429, 429, 429])
    const refusal = answers.find((a) => a.status === 429)!
    expect(refusal.body.message).toBe('You already have 2 solves running or waiting; at most 2 at a time per account. Wait for one to finish, then try again.')
    expect(refusal.body.data).toEqual({ solvesPerUser: 2 })
    expect((await theirs).status).toBe(200)
    // Once the account's solves are done, it solves again.
    expect((await solve(viewer, strongAcid)).status).toBe(200)
  })
})
