// Lab libraries: `use "name" @ N` keeps a system on one revision of a
// library, `use "name"` follows the latest, each run records which it used,
// and a missing library or revision is the compiler's diagnostic.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { storeRunToEnd } from '../setup/jobs'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

// Acetic acid, pKa 4.76 at 25 °C (handbook value, from memory); revision 2
// of the library moves it to 5.76 so the two revisions give different answers.
const libraryText = (pKa: number) => `system "Acid constants"
component H+ balance
component CH3COO- total 10 mM
reaction H2O <=> H+ + OH- pKw 14 cite "water (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa ${pKa} cite "acetic acid (from memory)"
`
const consumerText = (use: string) => `system "Vinegar rinse"
component H+ balance
component CH3COO- total 10 mM
${use}
`

/** pH of a weak acid HA at total c from the exact quadratic [H+]² + Ka[H+] − Ka·c = 0, water neglected (textbook closed form). */
function weakAcidPH(pKa: number, c: number): number {
  const ka = 10 ** -pKa
  return -Math.log10((-ka + Math.sqrt(ka * ka + 4 * ka * c)) / 2)
}

let owner: SignedIn
let lab: string

async function createSystem(slug: string, source: string) {
  const answer = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: slug, slug, source } })
  expect(answer.status).toBe(201)
}

async function run(slug: string) {
  const answer = await storeRunToEnd(`/api/labs/${lab}/systems/${slug}/runs`, { cookie: owner.cookie, body: {} })
  return answer
}

beforeAll(async () => {
  owner = await signUp('librarian')
  lab = await makeLab(owner)
  await createSystem('acids', libraryText(4.76))
  const marked = await api(`/api/labs/${lab}/systems/acids/library`, { method: 'PUT', cookie: owner.cookie, body: { isLibrary: true } })
  expect(marked.status).toBe(200)
  await createSystem('pinned-rinse', consumerText('use "acids" @ 1'))
  await createSystem('latest-rinse', consumerText('use "acids"'))
})

describe('library pinning', () => {
  it('keeps a pinned system on revision 1 after the library moves to 2, while `use` without @ follows it', async () => {
    const first = await run('pinned-rinse')
    expect(first.status).toBe(201)
    expect(first.body.libraries).toEqual([{ name: 'acids', revision: 1 }])
    expect(first.body.result.pH).toBeCloseTo(weakAcidPH(4.76, 0.01), 2)

    const moved = await api(`/api/labs/${lab}/systems/acids`, { method: 'PATCH', cookie: owner.cookie, body: { source: libraryText(5.76), message: 'Moved pKa', baseRevision: 1 } })
    expect(moved.status).toBe(200)
    expect(moved.body.system.latest.number).toBe(2)

    const stored = await api(`/api/labs/${lab}/systems/pinned-rinse/runs/${first.body.id}`, { cookie: owner.cookie })
    expect(stored.body.result.pH).toBe(first.body.result.pH)
    expect(stored.body.libraries).toEqual([{ name: 'acids', revision: 1 }])

    const again = await run('pinned-rinse')
    expect(again.body.libraries).toEqual([{ name: 'acids', revision: 1 }])
    expect(again.body.result.pH).toBeCloseTo(first.body.result.pH, 10)

    const following = await run('latest-rinse')
    expect(following.status).toBe(201)
    expect(following.body.libraries).toEqual([{ name: 'acids', revision: 2 }])
    expect(following.body.result.pH).toBeCloseTo(weakAcidPH(5.76, 0.01), 2)
  })

  it('answers 422 with the compiler diagnostic for a missing library or revision', async () => {
    await createSystem('missing-lib', consumerText('use "bases"'))
    const noLibrary = await run('missing-lib')
    expect(noLibrary.status).toBe(422)
    expect(noLibrary.body.data.diagnostics).toContainEqual(expect.objectContaining({ code: 'P070', message: expect.stringContaining('no library "bases"') }))

    await createSystem('missing-rev', consumerText('use "acids" @ 9'))
    const noRevision = await run('missing-rev')
    expect(noRevision.status).toBe(422)
    expect(noRevision.body.data.diagnostics).toContainEqual(expect.objectContaining({ code: 'P071', message: expect.stringMatching(/no revision 9 \(its latest is \d\)/) }))
  })

  it('resolves only systems marked as library, and only in the same lab', async () => {
    const otherLab = await makeLab(owner)
    const check = (labSlug: string, source: string) => api(`/api/labs/${labSlug}/check`, { method: 'POST', cookie: owner.cookie, body: { source } })
    const here = await check(lab, consumerText('use "acids" @ 1'))
    expect(here.body).toMatchObject({ ok: true, libraries: [{ name: 'acids', revision: 1 }] })
    const elsewhere = await check(otherLab, consumerText('use "acids"'))
    expect(elsewhere.body.ok).toBe(false)
    expect(elsewhere.body.diagnostics.map((d: { code: string }) => d.code)).toContain('P070')
    const notMarked = await check(lab, consumerText('use "pinned-rinse"'))
    expect(notMarked.body.diagnostics.map((d: { code: string }) => d.code)).toContain('P070')
  })

  it('lists libraries with their latest revision and serves the text of each revision', async () => {
    const list = await api(`/api/labs/${lab}/libraries`, { cookie: owner.cookie })
    expect(list.body.libraries).toEqual([{ name: 'acids', title: 'acids', latestRevision: 2 }])
    const rev1 = await api(`/api/labs/${lab}/libraries/acids/revisions/1`, { cookie: owner.cookie })
    expect(rev1.body.source).toContain('pKa 4.76')
    const none = await api(`/api/labs/${lab}/libraries/acids/revisions/3`, { cookie: owner.cookie })
    expect(none.status).toBe(404)
    const outsider = await signUp('outsider')
    expect((await api(`/api/labs/${lab}/libraries`, { cookie: outsider.cookie })).status).toBe(404)
  })

  it("shows on the library's page which systems use it, at which revision, and what their newest run used", async () => {
    const page = await api(`/api/labs/${lab}/libraries/acids`, { cookie: owner.cookie })
    expect(page.status).toBe(200)
    expect(page.body.usedBy).toContainEqual(expect.objectContaining({ slug: 'pinned-rinse', pinned: 1, lastRunUsed: 1 }))
    expect(page.body.usedBy).toContainEqual(expect.objectContaining({ slug: 'latest-rinse', pinned: null, lastRunUsed: 2 }))
    expect(page.body.usedBy.map((u: { slug: string }) => u.slug)).not.toContain('acids')
  })

  it('lets only editors mark a library', async () => {
    const viewer = await signUp('viewer')
    const withViewer = await makeLab(owner, [{ who: viewer, role: 'viewer' }])
    await api(`/api/labs/${withViewer}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'L', slug: 'lib' } })
    const refused = await api(`/api/labs/${withViewer}/systems/lib/library`, { method: 'PUT', cookie: viewer.cookie, body: { isLibrary: true } })
    expect(refused.status).toBe(403)
    const bad = await api(`/api/labs/${withViewer}/systems/lib/library`, { method: 'PUT', cookie: owner.cookie, body: { isLibrary: 'yes' } })
    expect(bad.status).toBe(400)
  })
})
