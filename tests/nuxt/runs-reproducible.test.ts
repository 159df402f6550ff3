// A stored run is shown and compared from what it stored — its compiled
// model (with the library revisions it used) and the compiler and solver
// versions — not from a recompile of its text with today's libraries or
// today's compiler. Runs stored before models were still open, and say so.
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { TEST_DATABASE_URL } from '../setup/test-database'

await useBuiltServer()

// Acetic acid pKa 4.76 at 25 °C (handbook value, from memory); 5.50 is a demo value for the library's later revision.
const library = (pKa: string) => `system "Acid constants"
component H+ balance
component CH3COO- total 10 mM
reaction H2O <=> H+ + OH- pKw 14 cite "water (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa ${pKa} cite "acetic acid (from memory)"
`
const consumer = (total: string) => `system "Vinegar rinse"
use "acids"
activity ideal
component H+ balance
component CH3COO- total ${total}
`

let owner: SignedIn, viewer: SignedIn
let lab: string
let db: mysql.Connection
const vinegar = (path = '') => `/api/labs/${lab}/systems/vinegar${path}`
const runCount = async () => Number(((await db.query('SELECT COUNT(*) AS n FROM runs'))[0] as { n: number }[])[0]!.n)

beforeAll(async () => {
  db = await mysql.createConnection(TEST_DATABASE_URL)
  ;[owner, viewer] = await Promise.all([signUp('chemist'), signUp('onlooker')])
  lab = await makeLab(owner, [{ who: viewer, role: 'viewer' }])
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Acids', slug: 'acids', source: library('4.76') } })).status).toBe(201)
  expect((await api(`/api/labs/${lab}/systems/acids/library`, { method: 'PUT', cookie: owner.cookie, body: { isLibrary: true } })).status).toBe(200)
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Vinegar', slug: 'vinegar', source: consumer('10 mM') } })).status).toBe(201)
})
afterAll(async () => {
  await db?.end()
})

const pKaOf = (model: { reactions: { equation: string, value: number }[] }) => model.reactions.find((r) => r.equation.includes('CH3COOH'))?.value

describe('a stored run', () => {
  it('after its library moved, still shows the library revision it was solved with, and compares from it', async () => {
    const stored = await storeRunToEnd(vinegar('/runs'), { cookie: owner.cookie, body: {} })
    expect(stored.status).toBe(201)
    expect(stored.body.model.libraries).toEqual([{ name: 'acids', revision: 1 }])
    expect(pKaOf(stored.body.model)).toBe(4.76)

    // The library moves on, and the system gets a second revision that follows it.
    expect((await api(`/api/labs/${lab}/systems/acids`, { method: 'PATCH', cookie: owner.cookie, body: { source: library('5.50'), baseRevision: 1 } })).status).toBe(200)
    expect((await api(vinegar(), { method: 'PATCH', cookie: owner.cookie, body: { source: consumer('1 mM'), baseRevision: 1 } })).status).toBe(200)

    const reopened = await api(vinegar(`/runs/${stored.body.id}`), { cookie: viewer.cookie })
    expect(reopened.body.model).toEqual(stored.body.model)
    expect(reopened.body.result).toEqual(stored.body.result)

    // Revision 1 from its stored run (pKa 4.76), revision 2 solved now with the library's revision 2 (pKa 5.50).
    const before = await runCount()
    const compared = await api(vinegar('/compare?from=1&to=2'), { cookie: viewer.cookie })
    expect(compared.status).toBe(200)
    expect(compared.body.solved.from).toMatchObject({ origin: 'stored', runId: stored.body.id, model: 'stored' })
    expect(compared.body.solved.to).toMatchObject({ origin: 'solved-now', runId: null })
    const constant = compared.body.modelDiff.find((c: { kind: string, name: string }) => c.kind === 'constant' && c.name === 'CH3COOH')
    expect(constant).toMatchObject({ from: 'pKa 4.76', to: 'pKa 5.50' })
    expect(await runCount()).toBe(before)
  })

  it('after a default in the compiler changed, shows the model that was solved, not today\'s compile', async () => {
    const stored = await storeRunToEnd(vinegar('/runs'), { cookie: owner.cookie, body: { revision: 1 } })
    expect(stored.status).toBe(201)
    // As if an older compiler had made the stored model with another default temperature and a pKa read differently.
    const older = structuredClone(stored.body.model)
    older.temperatureC = 20
    older.reactions.find((r: { equation: string }) => r.equation.includes('CH3COOH')).value = 4.75
    await db.query('UPDATE runs SET model = ?, compiler_version = ? WHERE id = ?', [JSON.stringify(older), '0.9.0', stored.body.id])

    const reopened = await api(vinegar(`/runs/${stored.body.id}`), { cookie: viewer.cookie })
    expect(reopened.body).toMatchObject({ compilerVersion: '0.9.0', storedModel: true })
    expect(reopened.body.model.temperatureC).toBe(20)
    expect(pKaOf(reopened.body.model)).toBe(4.75)

    // Compare reads the stored model too: revision 1 was solved at 20 °C, revision 2 (no run: compiled now) at today's 25 °C.
    const compared = await api(vinegar('/compare?from=1&to=2'), { cookie: viewer.cookie })
    expect(compared.body.solved.from).toMatchObject({ origin: 'stored', runId: stored.body.id, compilerVersion: '0.9.0' })
    expect(compared.body.modelDiff).toContainEqual(expect.objectContaining({ kind: 'condition', name: 'temperature', from: '20.0 °C', to: '25.0 °C' }))
    expect(compared.body.problems).toContainEqual(expect.stringMatching(/^The model of revision 1 was made by compiler 0\.9\.0 and that of revision 2 by compiler \d+\.\d+\.\d+: part of the model difference may come from the compiler/))
  })

  it('stored before models were, still opens: no model, its bytes measured, and compare says it predates stored models', async () => {
    const stored = await storeRunToEnd(vinegar('/runs'), { cookie: owner.cookie, body: { revision: 1 } })
    await db.query('UPDATE runs SET model = NULL, compiler_version = NULL, stored_bytes = NULL WHERE id = ?', [stored.body.id])

    const reopened = await api(vinegar(`/runs/${stored.body.id}`), { cookie: viewer.cookie })
    expect(reopened.status).toBe(200)
    expect(reopened.body).toMatchObject({ model: null, compilerVersion: null, storedModel: false })
    expect(reopened.body.result).toEqual(stored.body.result)
    const listed = (await api(vinegar('/runs'), { cookie: viewer.cookie })).body.runs.find((r: { id: number }) => r.id === stored.body.id)
    expect(listed.storedBytes).toBe(Buffer.byteLength(JSON.stringify(stored.body.result)))

    const compared = await api(vinegar('/compare?from=1&to=2'), { cookie: viewer.cookie })
    expect(compared.body.solved.from).toMatchObject({ origin: 'stored', runId: stored.body.id, model: 'compiled-now', compilerVersion: null })
    expect(compared.body.problems).toContainEqual(expect.stringMatching(new RegExp(`^Run ${stored.body.number} of revision 1 predates stored models`)))
  })
})
