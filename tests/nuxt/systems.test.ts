// Systems in a lab: viewers read, editors write, revisions are numbered and
// hashed, and a save based on an old revision is refused.
import { createHash } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signInAs, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

let owner: SignedIn, editor: SignedIn, reviewer: SignedIn, viewer: SignedIn, outsider: SignedIn
let lab: string
const systems = () => `/api/labs/${lab}/systems`

beforeAll(async () => {
  ;[owner, editor, reviewer, viewer, outsider] = await Promise.all([signUp('owner'), signUp('editor'), signUp('reviewer'), signUp('viewer'), signUp('outsider')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: reviewer, role: 'reviewer' }, { who: viewer, role: 'viewer' }])
})

describe('systems', () => {
  it('lets an editor create a system whose starter source is revision 1 with its sha256', async () => {
    const created = await api(systems(), { method: 'POST', cookie: editor.cookie, body: { title: 'Zinc rinse', slug: 'zinc-rinse' } })
    expect(created.status).toBe(201)
    const latest = created.body.system.latest
    expect(latest.number).toBe(1)
    expect(latest.source).toMatch(/^system "Zinc rinse"\n/)
    expect(latest.sha256).toBe(createHash('sha256').update(latest.source).digest('hex'))
    expect(latest.author).toBe(editor.user.name)
  })

  it('keeps a given source as it is', async () => {
    const source = 'system "Copper bath"\n# brought from a file\n'
    const created = await api(systems(), { method: 'POST', cookie: owner.cookie, body: { title: 'Copper bath', slug: 'copper-bath', source } })
    expect(created.status).toBe(201)
    const read = await api(`${systems()}/copper-bath`, { cookie: viewer.cookie })
    expect(read.body.system.latest.source).toBe(source)
  })

  it('refuses viewers and reviewers every write with 403', async () => {
    await api(systems(), { method: 'POST', cookie: owner.cookie, body: { title: 'Guarded', slug: 'guarded' } })
    for (const who of [viewer, reviewer]) {
      expect((await api(systems(), { method: 'POST', cookie: who.cookie, body: { title: 'Nope', slug: 'nope' } })).status).toBe(403)
      expect((await api(`${systems()}/guarded`, { method: 'PATCH', cookie: who.cookie, body: { title: 'Renamed' } })).status).toBe(403)
      expect((await api(`${systems()}/guarded`, { method: 'DELETE', cookie: who.cookie })).status).toBe(403)
    }
    expect((await api(`${systems()}/guarded`, { cookie: viewer.cookie })).body.system.title).toBe('Guarded')
  })

  it('lists systems with their latest revision for every member', async () => {
    const list = await api(systems(), { cookie: reviewer.cookie })
    expect(list.status).toBe(200)
    expect(list.body.systems).toContainEqual(expect.objectContaining({ slug: 'zinc-rinse', title: 'Zinc rinse', latestRevision: 1, isLibrary: false }))
  })

  it('answers 401 to anonymous visitors and 404 to non-members and missing systems', async () => {
    expect((await api(systems())).status).toBe(401)
    expect((await api(`${systems()}/zinc-rinse`)).status).toBe(401)
    expect((await api(systems(), { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${systems()}/zinc-rinse`, { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${systems()}/zinc-rinse`, { method: 'DELETE', cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${systems()}/no-such-system`, { cookie: owner.cookie })).status).toBe(404)
  })

  it('refuses a bad address, a missing title and a duplicate address with a message', async () => {
    const badSlug = await api(systems(), { method: 'POST', cookie: editor.cookie, body: { title: 'X', slug: 'Has Spaces' } })
    expect(badSlug.status).toBe(400)
    expect(badSlug.body.data.issues[0]).toMatchObject({ path: 'slug' })
    const noTitle = await api(systems(), { method: 'POST', cookie: editor.cookie, body: { title: '  ', slug: 'untitled' } })
    expect(noTitle.status).toBe(400)
    expect(noTitle.body.message).toMatch(/title/i)
    const duplicate = await api(systems(), { method: 'POST', cookie: editor.cookie, body: { title: 'Again', slug: 'zinc-rinse' } })
    expect(duplicate.status).toBe(409)
  })

  it('renames without adding a revision', async () => {
    await api(systems(), { method: 'POST', cookie: editor.cookie, body: { title: 'Old name', slug: 'renamed' } })
    const renamed = await api(`${systems()}/renamed`, { method: 'PATCH', cookie: editor.cookie, body: { title: 'New name' } })
    expect(renamed.status).toBe(200)
    expect(renamed.body.system).toMatchObject({ title: 'New name', latest: { number: 1 } })
    const empty = await api(`${systems()}/renamed`, { method: 'PATCH', cookie: editor.cookie, body: {} })
    expect(empty.status).toBe(400)
  })

  it('saves a new source as the next revision and refuses one based on an older revision (409)', async () => {
    await api(systems(), { method: 'POST', cookie: editor.cookie, body: { title: 'Revised', slug: 'revised' } })
    const second = await api(`${systems()}/revised`, { method: 'PATCH', cookie: editor.cookie, body: { source: 'system "Revised"\n# two\n', message: 'second', baseRevision: 1 } })
    expect(second.status).toBe(200)
    expect(second.body.system.latest).toMatchObject({ number: 2, message: 'second' })
    const stale = await api(`${systems()}/revised`, { method: 'PATCH', cookie: owner.cookie, body: { source: 'system "Revised"\n# mine\n', baseRevision: 1 } })
    expect(stale.status).toBe(409)
    expect(stale.body.data.latestRevision).toBe(2)
    const noBase = await api(`${systems()}/revised`, { method: 'PATCH', cookie: owner.cookie, body: { source: 'x' } })
    expect(noBase.status).toBe(400)
    expect(noBase.body.message).toMatch(/baseRevision/)
  })

  it('lets an editor delete a system; it is gone afterwards', async () => {
    await api(systems(), { method: 'POST', cookie: owner.cookie, body: { title: 'Doomed', slug: 'doomed' } })
    expect((await api(`${systems()}/doomed`, { method: 'DELETE', cookie: editor.cookie })).status).toBe(200)
    expect((await api(`${systems()}/doomed`, { cookie: owner.cookie })).status).toBe(404)
  })
})

describe('demo lab', () => {
  it('is seeded with one account per role and at least one system', async () => {
    const ownerSession = await signInAs('owner')
    const members = await api('/api/labs/demo/members', { cookie: ownerSession.cookie })
    expect(members.body.members.map((m: { role: string }) => m.role).sort()).toEqual(['editor', 'owner', 'reviewer', 'viewer'])
    const list = await api('/api/labs/demo/systems', { cookie: (await signInAs('viewer')).cookie })
    expect(list.body.systems.length).toBeGreaterThan(0)
  })
})
