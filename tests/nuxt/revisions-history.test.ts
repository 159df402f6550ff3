// Revisions: immutable, numbered without gaps, a stale save conflicts with
// both texts in the answer, restore makes a new revision; roles on every route.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

let owner: SignedIn, editor: SignedIn, reviewer: SignedIn, viewer: SignedIn, outsider: SignedIn
let lab: string
const system = () => `/api/labs/${lab}/systems/bath`
const source = (n: number) => `system "Bath"\ncomponent H+ pH ${n}\n`

async function save(who: SignedIn, text: string, baseRevision: number, message = '') {
  return api(system(), { method: 'PATCH', cookie: who.cookie, body: { source: text, baseRevision, message } })
}

beforeAll(async () => {
  ;[owner, editor, reviewer, viewer, outsider] = await Promise.all([signUp('owner'), signUp('editor'), signUp('reviewer'), signUp('viewer'), signUp('outsider')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: reviewer, role: 'reviewer' }, { who: viewer, role: 'viewer' }])
  const created = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Bath', slug: 'bath', source: source(1) } })
  expect(created.status).toBe(201)
})

describe('revisions', () => {
  it('numbers saves 1, 2, 3 with parents, authors and messages, newest first, and never changes an old one', async () => {
    expect((await save(editor, source(2), 1, 'raise the pH')).status).toBe(200)
    expect((await save(owner, source(3), 2, 'raise it again')).status).toBe(200)
    const list = await api(`${system()}/revisions`, { cookie: viewer.cookie })
    expect(list.status).toBe(200)
    expect(list.body.revisions.map((r: any) => [r.number, r.parent, r.author, r.message])).toEqual([
      [3, 2, owner.user.name, 'raise it again'],
      [2, 1, editor.user.name, 'raise the pH'],
      [1, null, editor.user.name, 'Created'],
    ])
    const first = await api(`${system()}/revisions/1`, { cookie: viewer.cookie })
    expect(first.body.revision.source).toBe(source(1))
    expect(first.body.latestRevision).toBe(3)
  })

  it('refuses a save based on an old revision with 409 carrying the latest text and the text sent', async () => {
    const latest = (await api(`${system()}/revisions`, { cookie: editor.cookie })).body.revisions[0].number
    const stale = await save(editor, source(9), latest - 1)
    expect(stale.status).toBe(409)
    expect(stale.body.data.latestRevision).toBe(latest)
    expect(stale.body.data.latest.source).toBe(source(3))
    expect(stale.body.data.yourSource).toBe(source(9))
    // Nothing was written: the number after the conflict is still the next one.
    expect((await save(editor, source(4), latest)).body.system.latest.number).toBe(latest + 1)
  })

  it('lets exactly one of two simultaneous saves from the same base win, leaving no gap', async () => {
    const before = (await api(`${system()}/revisions`, { cookie: editor.cookie })).body.revisions[0].number
    const answers = await Promise.all([save(editor, source(20), before), save(owner, source(21), before)])
    expect(answers.map(a => a.status).sort()).toEqual([200, 409])
    const numbers = (await api(`${system()}/revisions`, { cookie: editor.cookie })).body.revisions.map((r: any) => r.number)
    expect(numbers).toEqual(Array.from({ length: before + 1 }, (_, i) => before + 1 - i))
  })

  it('restores an old revision as a new one, keeping the ones in between', async () => {
    const before = (await api(`${system()}/revisions`, { cookie: editor.cookie })).body.revisions[0].number
    const restored = await api(`${system()}/revisions/1/restore`, { method: 'POST', cookie: editor.cookie, body: { baseRevision: before } })
    expect(restored.status).toBe(201)
    expect(restored.body.revision).toMatchObject({ number: before + 1, parent: before, message: 'Restore revision 1', source: source(1) })
    expect((await api(`${system()}/revisions/${before}`, { cookie: viewer.cookie })).status).toBe(200)
    // Restoring the text the system already has makes no empty revision.
    const again = await api(`${system()}/revisions/1/restore`, { method: 'POST', cookie: editor.cookie, body: {} })
    expect(again.status).toBe(400)
    expect(again.body.message).toMatch(/same text as the latest/)
    // A history page that is out of date gets the conflict, with both texts.
    const stale = await api(`${system()}/revisions/2/restore`, { method: 'POST', cookie: editor.cookie, body: { baseRevision: before } })
    expect(stale.status).toBe(409)
    expect(stale.body.data.latest.number).toBe(before + 1)
    expect(stale.body.data.yourSource).toBe(source(2))
  })

  it('answers 404 for a revision that does not exist and 400 for one that is not a number', async () => {
    expect((await api(`${system()}/revisions/999`, { cookie: viewer.cookie })).status).toBe(404)
    const bad = await api(`${system()}/revisions/two`, { cookie: viewer.cookie })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/whole number/)
  })

  it('enforces roles: viewers and reviewers read but cannot save or restore; outsiders get 404; anonymous 401', async () => {
    const latest = (await api(`${system()}/revisions`, { cookie: editor.cookie })).body.revisions[0].number
    for (const who of [viewer, reviewer]) {
      expect((await api(`${system()}/revisions`, { cookie: who.cookie })).status).toBe(200)
      expect((await save(who, source(30), latest)).status).toBe(403)
      expect((await api(`${system()}/revisions/2/restore`, { method: 'POST', cookie: who.cookie, body: {} })).status).toBe(403)
    }
    for (const path of ['/revisions', '/revisions/1']) expect((await api(`${system()}${path}`, { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${system()}/revisions/2/restore`, { method: 'POST', cookie: outsider.cookie, body: {} })).status).toBe(404)
    expect((await api(`${system()}/revisions`)).status).toBe(401)
    expect((await api(`${system()}/revisions`, { cookie: editor.cookie })).body.revisions[0].number).toBe(latest)
  })
})
