// Reviews: asked of a member with the reviewer role or higher, line comments
// on either side, approve / request changes by the one asked (never by the
// one who asked), "waiting for me", mails, and roles on every route.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { waitForMail } from '../setup/mail'

await useBuiltServer()

let owner: SignedIn, editor: SignedIn, reviewer: SignedIn, viewer: SignedIn, outsider: SignedIn
let lab: string
const reviews = () => `/api/labs/${lab}/reviews`

beforeAll(async () => {
  ;[owner, editor, reviewer, viewer, outsider] = await Promise.all([signUp('owner'), signUp('editor'), signUp('reviewer'), signUp('viewer'), signUp('outsider')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: reviewer, role: 'reviewer' }, { who: viewer, role: 'viewer' }])
  const system = `/api/labs/${lab}/systems/rinse`
  expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Rinse', slug: 'rinse', source: 'system "Rinse"\ncomponent H+ pH 7\n' } })).status).toBe(201)
  // Revisions 2, 3 and 4, so each test below asks for a review of its own pair.
  for (const [base, pH] of [[1, 8], [2, 8.5], [3, 9]]) {
    expect((await api(system, { method: 'PATCH', cookie: editor.cookie, body: { source: `system "Rinse"\ncomponent H+ pH ${pH}\n# rinse at pH ${pH}\n`, baseRevision: base } })).status).toBe(200)
  }
})

async function request(by: SignedIn, reviewerId: number, extra: Record<string, unknown> = {}) {
  return api(reviews(), { method: 'POST', cookie: by.cookie, body: { system: 'rinse', from: 1, to: 2, reviewerId, note: 'pH raised for the new line', ...extra } })
}

describe('reviews', () => {
  it('lets an editor ask a reviewer, shows it waiting for the reviewer only, and in the history of revision 2', async () => {
    const asked = await request(editor, reviewer.user.id)
    expect(asked.status).toBe(201)
    expect(asked.body.review).toMatchObject({ from: 1, to: 2, state: 'open', requester: { name: editor.user.name }, reviewer: { name: reviewer.user.name } })
    const waiting = await api('/api/reviews/waiting', { cookie: reviewer.cookie })
    expect(waiting.body.waiting.map((r: any) => r.id)).toContain(asked.body.review.id)
    expect((await api('/api/reviews/waiting', { cookie: editor.cookie })).body.waiting).toEqual([])
    expect((await api('/api/reviews/waiting', { cookie: editor.cookie })).body.requested[0].id).toBe(asked.body.review.id)
    const history = await api(`/api/labs/${lab}/systems/rinse/revisions`, { cookie: viewer.cookie })
    expect(history.body.revisions.find((r: any) => r.number === 2).reviews).toEqual([{ id: asked.body.review.id, state: 'open', against: 1, reviewer: reviewer.user.name }])
    const mail = await waitForMail(reviewer.user.email, /^Review requested: Rinse, revision 2 against 1$/)
    expect(mail.text).toContain(`/labs/${lab}/reviews/${asked.body.review.id}`)
    expect(mail.text).toContain('pH raised for the new line')
    // Asking the same person again for the same pair while it is open points to the open review.
    const again = await request(editor, reviewer.user.id)
    expect(again.status).toBe(409)
    expect(again.body.message).toBe(`${reviewer.user.name} already has this review open (review ${asked.body.review.id}); add a comment there instead`)
  })

  it('refuses a reviewer who is a viewer, the requester themself, an outsider, and equal revisions, saying what to change', async () => {
    const asViewer = await request(editor, viewer.user.id)
    expect(asViewer.status).toBe(400)
    expect(asViewer.body.message).toMatch(/is a viewer here; choose a member with the reviewer role or higher/)
    expect((await request(editor, editor.user.id)).body.message).toMatch(/Ask someone else/)
    expect((await request(editor, outsider.user.id)).body.message).toMatch(/must be a member of this lab/)
    expect((await request(editor, reviewer.user.id, { to: 1 })).body.data.issues[0]).toEqual({ path: 'to', message: 'Choose two different revisions to compare' })
    expect((await request(editor, reviewer.user.id, { to: 7 })).status).toBe(404)
  })

  it('takes comments on a line of either side from reviewers, refusing viewers and lines past the end', async () => {
    const id = (await request(editor, reviewer.user.id, { to: 3 })).body.review.id
    const url = `${reviews()}/${id}/comments`
    const onNew = await api(url, { method: 'POST', cookie: reviewer.cookie, body: { side: 'to', line: 2, body: 'Why pH 8 and not 7.5?' } })
    expect(onNew.status).toBe(201)
    const reply = await api(url, { method: 'POST', cookie: editor.cookie, body: { side: 'from', line: 2, body: 'The new line needs 8.' } })
    // Each comment quotes the line it is about, from its own side's text.
    expect(reply.body.comments.map((c: any) => [c.side, c.line, c.quote, c.body, c.author])).toEqual([
      ['to', 2, 'component H+ pH 8.5', 'Why pH 8 and not 7.5?', reviewer.user.name],
      ['from', 2, 'component H+ pH 7', 'The new line needs 8.', editor.user.name],
    ])
    expect((await api(url, { method: 'POST', cookie: viewer.cookie, body: { side: 'to', line: 1, body: 'me too' } })).status).toBe(403)
    const past = await api(url, { method: 'POST', cookie: reviewer.cookie, body: { side: 'from', line: 9, body: 'x' } })
    expect(past.status).toBe(400)
    expect(past.body.message).toMatch(/Revision 1 has 3 lines; choose a line from 1 to 3/)
    expect((await api(url, { method: 'POST', cookie: reviewer.cookie, body: { side: 'left', line: 1, body: 'x' } })).status).toBe(400)
    const read = await api(`${reviews()}/${id}`, { cookie: viewer.cookie })
    expect(read.body).toMatchObject({ canComment: false, canDecide: false })
    expect(read.body.comments).toHaveLength(2)
  })

  it('lets the reviewer approve or ask for changes, never the one who asked, and mails the decision', async () => {
    const id = (await request(editor, reviewer.user.id, { to: 4 })).body.review.id
    const decide = (who: SignedIn, decision: string) => api(`${reviews()}/${id}/decision`, { method: 'POST', cookie: who.cookie, body: { decision, note: 'ok' } })
    const own = await decide(editor, 'approved')
    expect(own.status).toBe(403)
    expect(own.body.message).toMatch(/You asked for this review/)
    expect((await decide(viewer, 'approved')).status).toBe(403)
    expect((await decide(owner, 'approved')).body.message).toMatch(/only they can approve/)
    expect((await decide(reviewer, 'maybe')).status).toBe(400)
    expect((await decide(reviewer, 'changes_requested')).body.review.state).toBe('changes_requested')
    const approved = await decide(reviewer, 'approved')
    expect(approved.status).toBe(200)
    expect(approved.body.review).toMatchObject({ state: 'approved', decisionNote: 'ok' })
    const mail = await waitForMail(editor.user.email, /^Review approved: Rinse, revision 4$/)
    expect(mail.text).toContain(`/labs/${lab}/reviews/${id}`)
    expect((await api('/api/reviews/waiting', { cookie: reviewer.cookie })).body.waiting.map((r: any) => r.id)).not.toContain(id)
  })

  it('hides reviews from outsiders (404) and refuses viewers and reviewers asking for one (403)', async () => {
    const id = (await request(editor, reviewer.user.id, { from: 2, to: 3 })).body.review.id
    expect((await api(reviews(), { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${reviews()}/${id}`, { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${reviews()}/${id}/comments`, { method: 'POST', cookie: outsider.cookie, body: { side: 'to', line: 1, body: 'x' } })).status).toBe(404)
    expect((await api(`${reviews()}/${id}/decision`, { method: 'POST', cookie: outsider.cookie, body: { decision: 'approved' } })).status).toBe(404)
    expect((await request(viewer, reviewer.user.id)).status).toBe(403)
    expect((await request(reviewer, owner.user.id)).status).toBe(403)
    expect((await api(`${reviews()}/999999`, { cookie: viewer.cookie })).status).toBe(404)
    expect((await api(`${reviews()}?system=rinse&state=open`, { cookie: viewer.cookie })).body.reviews.every((r: any) => r.state === 'open' && r.system.slug === 'rinse')).toBe(true)
    expect((await api('/api/reviews/waiting')).status).toBe(401)
  })
})
