// Compare: both texts, the model diff and the results diff of two revisions,
// from their stored runs, or solved in memory (never stored) when they have none.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

let owner: SignedIn, viewer: SignedIn, outsider: SignedIn
let lab: string
const system = () => `/api/labs/${lab}/systems/ammine`

/** Copper and one ammine complex at a fixed free ammonia (demo values). */
const ammine = (logBeta: string) => `system "Copper ammine at fixed free ammonia"
temperature 25 C
activity ideal
component Cu^2+  total 1.0 mmol/L
component NH3    free 1.0 mmol/L
reaction Cu^2+ + NH3 <=> CuNH3^2+   logbeta ${logBeta}   cite "demo value"
`

beforeAll(async () => {
  ;[owner, viewer, outsider] = await Promise.all([signUp('owner'), signUp('viewer'), signUp('outsider')])
  lab = await makeLab(owner, [{ who: viewer, role: 'viewer' }])
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Ammine', slug: 'ammine', source: ammine('4.0') } })).status).toBe(201)
  expect((await api(system(), { method: 'PATCH', cookie: owner.cookie, body: { source: ammine('5.0'), baseRevision: 1, message: 'log beta up by one' } })).status).toBe(200)
  expect((await api(system(), { method: 'PATCH', cookie: owner.cookie, body: { source: 'system "Broken"\ncomponent Cu^2+ total lots\n', baseRevision: 2 } })).status).toBe(200)
})

describe('compare', () => {
  it('reports a raised log K in the model diff, and the complex up and the free metal down in the results diff', async () => {
    const answer = await api(`${system()}/compare?from=1&to=2`, { cookie: viewer.cookie })
    expect(answer.status).toBe(200)
    expect(answer.body.from.source).toBe(ammine('4.0'))
    expect(answer.body.to.source).toBe(ammine('5.0'))
    expect(answer.body.problems).toEqual([])
    expect(answer.body.modelDiff).toEqual([expect.objectContaining({ kind: 'constant', name: 'CuNH3^2+', from: 'logbeta 4.00', to: 'logbeta 5.00' })])
    expect(answer.body.modelDiff[0].deltaLogK).toBeCloseTo(1, 9)
    // Closed form of a 1:1 complex at fixed free ligand (mass action and mass balance, common practice):
    // [M] = M_T / (1 + β[L]), so β from 1e4 to 1e5 at [L] = 1e-3 moves [M] by 11/101 and [ML] by (100/101)/(10/11).
    const species = Object.fromEntries(answer.body.resultsDiff.species.map((s: any) => [s.name, s]))
    expect(species['Cu^2+'].factor).toBeCloseTo(11 / 101, 6)
    expect(species['CuNH3^2+'].factor).toBeCloseTo((100 / 101) / (10 / 11), 6)
    expect(answer.body.resultsDiff.species[0].name).toBe('Cu^2+')
  })

  it('reads and never writes: a revision without a stored run is solved now and not stored; a stored run is used as stored', async () => {
    const count = async () => (await api(`${system()}/runs`, { cookie: owner.cookie })).body.runs.length
    expect(await count()).toBe(0)
    const first = await api(`${system()}/compare?from=1&to=2`, { cookie: owner.cookie })
    expect(first.body.solved.from).toMatchObject({ origin: 'solved-now', runId: null, model: 'compiled-now' })
    expect(first.body.solved.to).toMatchObject({ origin: 'solved-now', runId: null })
    expect(await count()).toBe(0)
    const history = await api(`${system()}/revisions`, { cookie: viewer.cookie })
    expect(history.body.revisions.find((r: any) => r.number === 2).run).toBeNull()

    const stored = await storeRunToEnd(`${system()}/runs`, { cookie: owner.cookie, body: { revision: 1 } })
    expect(stored.status).toBe(201)
    const second = await api(`${system()}/compare?from=1&to=2`, { cookie: viewer.cookie })
    expect(second.body.solved.from).toMatchObject({ origin: 'stored', runId: stored.body.id, model: 'stored', compilerVersion: stored.body.compilerVersion })
    expect(second.body.solved.to.origin).toBe('solved-now')
    expect(second.body.resultsDiff).toEqual(first.body.resultsDiff)
    expect(await count()).toBe(1)
  })

  it('still compares the text of a revision that does not compile, and says why the diffs are missing', async () => {
    const answer = await api(`${system()}/compare?from=2&to=3`, { cookie: viewer.cookie })
    expect(answer.status).toBe(200)
    expect(answer.body.to.source).toMatch(/total lots/)
    expect(answer.body.modelDiff).toBeNull()
    expect(answer.body.resultsDiff).toBeNull()
    expect(answer.body.problems[0]).toMatch(/^Revision 3 cannot be solved: .*line 2/)
  })

  it('for sweeps, reports where along the sweep a solid starts to precipitate and the largest change of each species', async () => {
    const hydroxide = (solidLine: string) => `system "Copper hydroxide across pH"
temperature 25 C
activity ideal
component H+     pH 5
component Cu^2+  total 1.0 mmol/L
reaction H2O <=> H+ + OH-              pKw 14.00   cite "demo value"
reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH-  pKsp 19.66  cite "demo value"
${solidLine}
sweep pH from 4 to 9 step 1
`
    const path = `/api/labs/${lab}/systems/hydroxide`
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Hydroxide', slug: 'hydroxide', source: hydroxide('solid Cu(OH)2(s) suppressed') } })).status).toBe(201)
    expect((await api(path, { method: 'PATCH', cookie: owner.cookie, body: { source: hydroxide(''), baseRevision: 1, message: 'let the hydroxide form' } })).status).toBe(200)
    const answer = await api(`${path}/compare?from=1&to=2`, { cookie: viewer.cookie })
    expect(answer.status).toBe(200)
    const diff = answer.body.resultsDiff
    expect(diff).toMatchObject({ kind: 'sweep', sweep: 'pH' })
    // With pKsp 19.66 and pKw 14, 1 mmol/L Cu2+ is saturated from pH 14 − (19.66 − 3)/2 ≈ 5.67 up
    // (solubility product, common practice): the hydroxide forms at pH 6, 7, 8 and 9.
    expect(diff.solids).toEqual([{ name: 'Cu(OH)2(s)', change: 'appears', at: [6, 7, 8, 9], ranges: [[6, 9]] }])
    // Free copper falls most at the top of the sweep, where [Cu2+] = Ksp / [OH-]^2 is smallest.
    const copper = diff.species.find((s: any) => s.name === 'Cu^2+')
    expect(copper.at).toBe(9)
    expect(Math.log10(copper.to)).toBeCloseTo(-19.66 + 2 * 5, 3)
    expect(answer.body.modelDiff).toEqual([expect.objectContaining({ kind: 'assumption', entity: 'solid', name: 'Cu(OH)2(s)', from: 'never precipitates', to: 'may precipitate' })])
  })

  it('answers 400 to a query without revision numbers, 404 to a missing revision or an outsider', async () => {
    const bad = await api(`${system()}/compare?from=one&to=2`, { cookie: viewer.cookie })
    expect(bad.status).toBe(400)
    expect(bad.body.data.issues[0].path).toBe('from')
    expect(bad.body.message).not.toMatch(/^from:/)
    expect((await api(`${system()}/compare?from=1`, { cookie: viewer.cookie })).status).toBe(400)
    expect((await api(`${system()}/compare?from=1&to=99`, { cookie: viewer.cookie })).status).toBe(404)
    expect((await api(`${system()}/compare?from=1&to=2`, { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${system()}/compare?from=1&to=2`)).status).toBe(401)
  })
})
