// Stored runs of saved revisions, who may make and read them, and the
// examples a new system can start from.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

let owner: SignedIn, editor: SignedIn, viewer: SignedIn, outsider: SignedIn
let lab: string
const system = (path = '') => `/api/labs/${lab}/systems/strong-acid${path}`

// 1 mmol/L HCl: fully dissociated, so pH = −log10(1e-3) = 3.00 (strong acid, common practice).
const strongAcid = `system "Pickling rinse"
activity ideal
component H+ total 1 mmol/L
component Cl- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
`

beforeAll(async () => {
  ;[owner, editor, viewer, outsider] = await Promise.all([signUp('owner'), signUp('editor'), signUp('viewer'), signUp('outsider')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: viewer, role: 'viewer' }])
  const created = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Pickling rinse', slug: 'strong-acid', source: strongAcid } })
  expect(created.status).toBe(201)
})

describe('runs', () => {
  it('gives a viewer a preview that stores nothing, and refuses a viewer a stored run with a message saying so', async () => {
    const refused = await storeRunToEnd(system('/runs'), { cookie: viewer.cookie, body: {} })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/^Viewers do not store runs: a viewer's Run is a preview, solved and kept nowhere/)
    const preview = await api(`/api/labs/${lab}/solve`, { method: 'POST', cookie: viewer.cookie, body: { source: strongAcid } })
    expect(preview.status).toBe(200)
    expect(preview.body.result.pH).toBeCloseTo(3, 3)
    expect(preview.body.model).toMatchObject({ title: 'Pickling rinse', activity: 'ideal' })
    expect(preview.body.compilerVersion).toMatch(/^\d+\.\d+\.\d+$/)
    expect((await api(system('/runs'), { cookie: viewer.cookie })).body.runs).toEqual([])
  })

  it('lets an editor run the saved revision and keeps the run with its result, its model and both versions', async () => {
    const made = await storeRunToEnd(system('/runs'), { cookie: editor.cookie, body: {} })
    expect(made.status).toBe(201)
    expect(made.body).toMatchObject({ revision: 1, status: 'ok', kind: 'single', createdBy: editor.user.name, storedModel: true })
    expect(made.body.result.pH).toBeCloseTo(3, 3)
    expect(made.body.compilerVersion).toMatch(/^\d+\.\d+\.\d+$/)
    expect(made.body.model).toMatchObject({ title: 'Pickling rinse', libraries: [] })
    expect(made.body.model.reactions[0]).toMatchObject({ kind: 'pKw', value: 14 })
    // The stored bytes are the model's and the result's JSON.
    expect(made.body.storedBytes).toBe(Buffer.byteLength(JSON.stringify(made.body.model)) + Buffer.byteLength(JSON.stringify(made.body.result)))

    const list = await api(system('/runs'), { cookie: viewer.cookie })
    expect(list.status).toBe(200)
    expect(list.body.runs[0]).toMatchObject({ id: made.body.id, revision: 1, storedModel: true, storedBytes: made.body.storedBytes })
    expect(list.body.runs[0].result).toBeUndefined()
    expect(list.body.runs[0].model).toBeUndefined()
    expect(list.body.storage.usedBytes).toBe(made.body.storedBytes)
    expect(list.body.storage.budgetBytes).toBe(250_000_000)

    const one = await api(system(`/runs/${made.body.id}`), { cookie: viewer.cookie })
    expect(one.status).toBe(200)
    expect(one.body.result).toEqual(made.body.result)
    expect(one.body.model).toEqual(made.body.model)
  })

  it('runs an older revision when asked, and lists runs newest first', async () => {
    const saved = await api(system(), { method: 'PATCH', cookie: editor.cookie, body: { source: strongAcid.replace(/1 mmol\/L/g, '10 mmol/L'), message: 'ten times stronger', baseRevision: 1 } })
    expect(saved.status).toBe(200)
    expect(saved.body.system.latest.number).toBe(2)
    const latest = await storeRunToEnd(system('/runs'), { cookie: editor.cookie, body: {} })
    expect(latest.body.revision).toBe(2)
    expect(latest.body.result.pH).toBeCloseTo(2, 3)
    const older = await storeRunToEnd(system('/runs'), { cookie: editor.cookie, body: { revision: 1 } })
    expect(older.status).toBe(201)
    expect(older.body.revision).toBe(1)
    expect(older.body.result.pH).toBeCloseTo(3, 3)
    const list = await api(system('/runs'), { cookie: viewer.cookie })
    expect(list.body.runs.slice(0, 2).map((r: { id: number }) => r.id)).toEqual([older.body.id, latest.body.id])
    expect((await storeRunToEnd(system('/runs'), { cookie: editor.cookie, body: { revision: 99 } })).status).toBe(404)
  })

  it('numbers runs per system (1, 2, 3 …), never giving a deleted run\'s number again', async () => {
    const numbers = (await api(system('/runs'), { cookie: viewer.cookie })).body.runs.map((r: { number: number }) => r.number)
    expect(numbers).toEqual([3, 2, 1])
    // Another system of the lab starts at run 1, whatever the lab's other systems have stored.
    const other = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Second rinse', slug: 'second-rinse', source: strongAcid } })
    expect(other.status).toBe(201)
    const first = await api(`/api/labs/${lab}/systems/second-rinse/runs`, { method: 'POST', cookie: editor.cookie, body: {} })
    expect(first.status).toBe(201)
    expect(first.body.number).toBe(1)
    expect(first.body.id).not.toBe(1)
    // Deleting the newest run does not hand its number to the next one.
    const newest = (await api(system('/runs'), { cookie: viewer.cookie })).body.runs[0]
    expect((await api(system(`/runs/${newest.id}`), { method: 'DELETE', cookie: editor.cookie })).status).toBe(200)
    const next = await storeRunToEnd(system('/runs'), { cookie: editor.cookie, body: {} })
    expect(next.body.number).toBe(4)
    const history = await api(system('/revisions'), { cookie: viewer.cookie })
    expect(history.body.revisions[0].run).toMatchObject({ id: next.body.id, number: 4 })
  })

  it('refuses a viewer the save (403) and keeps the revision', async () => {
    const refused = await api(system(), { method: 'PATCH', cookie: viewer.cookie, body: { source: '# mine', baseRevision: 2 } })
    expect(refused.status).toBe(403)
    expect((await api(system(), { cookie: viewer.cookie })).body.system.latest.number).toBe(2)
  })

  it('refuses a save from a stale revision with 409 naming the latest', async () => {
    const stale = await api(system(), { method: 'PATCH', cookie: owner.cookie, body: { source: strongAcid, baseRevision: 1 } })
    expect(stale.status).toBe(409)
    expect(stale.body.data.latestRevision).toBe(2)
  })

  it('answers 422 with the diagnostics when the saved text does not compile', async () => {
    const created = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Broken', slug: 'broken', source: 'system "Broken"\ncomponent H+ balance\nreaction H2O <=> H+ pKw 14\n' } })
    expect(created.status).toBe(201)
    const run = await api(`/api/labs/${lab}/systems/broken/runs`, { method: 'POST', cookie: editor.cookie, body: {} })
    expect(run.status).toBe(422)
    expect(run.body.data.diagnostics.some((d: { severity: string, range: { line: number } }) => d.severity === 'error' && d.range.line === 3)).toBe(true)
    expect((await api(`/api/labs/${lab}/systems/broken/runs`, { cookie: viewer.cookie })).body.runs).toEqual([])
  })

  it('answers 404 to non-members and 401 to anonymous visitors', async () => {
    const { body } = await api(system('/runs'), { cookie: owner.cookie })
    const id = body.runs[0].id
    expect((await api(system('/runs'), { cookie: outsider.cookie })).status).toBe(404)
    expect((await storeRunToEnd(system('/runs'), { cookie: outsider.cookie, body: {} })).status).toBe(404)
    expect((await api(system(`/runs/${id}`), { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(system('/runs'))).status).toBe(401)
    expect((await api(system(`/runs/${id + 1000}`), { cookie: owner.cookie })).status).toBe(404)
  })
})

describe('examples', () => {
  it('lists the shipped examples with titles and summaries, from the built server', async () => {
    const list = await api('/api/examples', { cookie: viewer.cookie })
    expect(list.status).toBe(200)
    const slugs = list.body.examples.map((e: { slug: string }) => e.slug)
    expect(slugs).toContain('copper-rinse-tank')
    expect(slugs).toContain('phosphate-buffer-recipe')
    const copper = list.body.examples.find((e: { slug: string }) => e.slug === 'copper-rinse-tank')
    expect(copper.title).toBe('Rinse tank after a copper ammonia etch')
    expect(copper.source).toMatch(/^system "Rinse tank after a copper ammonia etch"/)
    // Its only opening comment is where the constants come from, so the summary outlines the file instead.
    expect(copper.summary).toBe('Components H+, Cu^2+, NH3, Cl-; sweep: pH from 6 to 11 step 0.1')
  })

  it('reads one example, and says when there is no such example', async () => {
    const one = await api('/api/examples/zinc-sulfide-dosing', { cookie: viewer.cookie })
    expect(one.status).toBe(200)
    expect(one.body.source).toContain('sweep pH')
    expect(one.body.summary).toMatch(/^Sodium hydrosulfide is dosed/)
    const missing = await api('/api/examples/no-such-thing', { cookie: viewer.cookie })
    expect(missing.status).toBe(404)
    expect(missing.body.message).toBe('There is no example called "no-such-thing"')
    // The examples are readable signed out (the /examples pages and the home page show them).
    const signedOut = await api('/api/examples')
    expect(signedOut.status).toBe(200)
    expect(signedOut.body.examples.map((e: { slug: string }) => e.slug)).toContain('copper-rinse-tank')
  })

  it('solves an example for anyone, once, and names it as written', async () => {
    const first = await api('/api/examples/nickel-rinse-discharge/result')
    expect(first.status).toBe(200)
    expect(first.body.kind).toBe('sweep')
    expect(first.body.model.title).toBe('Nickel rinse water before discharge')
    // pH from 7 to 13 step 0.1: 61 points, every one converged.
    expect(first.body.result.points).toHaveLength(61)
    expect(first.body.result.points.every((p: { converged: boolean }) => p.converged)).toBe(true)
    const again = await api('/api/examples/nickel-rinse-discharge/result')
    expect(again.body).toEqual(first.body)
    // A map is compiled and described, not solved for a visitor.
    const map = await api('/api/examples/copper-hydroxide-carbonate-map/result')
    expect(map.status).toBe(200)
    expect(map.body.kind).toBe('map')
    expect(map.body.result).toBeNull()
    const missing = await api('/api/examples/no-such-thing/result')
    expect(missing.status).toBe(404)
    expect((await api('/api/examples/Not_A_Name/result')).status).toBe(400)
  })
})
