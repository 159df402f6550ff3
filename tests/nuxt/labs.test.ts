// Labs and members: who may see a lab, who may manage its members, and the
// rule that a lab always keeps an owner.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, freshEmail, joinByInvitation, makeLab, signInAs, signUp, type SignedIn } from '../setup/accounts'
import { waitForMail } from '../setup/mail'

await useBuiltServer()

let owner: SignedIn, editor: SignedIn, reviewer: SignedIn, viewer: SignedIn, outsider: SignedIn
let lab: string

beforeAll(async () => {
  ;[owner, editor, reviewer, viewer, outsider] = await Promise.all([signUp('owner'), signUp('editor'), signUp('reviewer'), signUp('viewer'), signUp('outsider')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: reviewer, role: 'reviewer' }, { who: viewer, role: 'viewer' }])
})

describe('labs', () => {
  it('asks anonymous visitors to sign in (401) on every lab route', async () => {
    for (const [method, path] of [['GET', '/api/labs'], ['POST', '/api/labs'], ['GET', `/api/labs/${lab}`], ['GET', `/api/labs/${lab}/members`]] as const) {
      const answer = await api(path, { method, body: method === 'POST' ? { name: 'x', slug: 'xx' } : undefined })
      expect(answer.status, `${method} ${path}`).toBe(401)
    }
  })

  it('makes the creator the owner and lists the lab among mine', async () => {
    const mine = await api('/api/labs', { cookie: owner.cookie })
    expect(mine.body.labs).toContainEqual({ slug: lab, name: `Lab ${lab}`, role: 'owner' })
    const theirs = await api('/api/labs', { cookie: viewer.cookie })
    expect(theirs.body.labs).toContainEqual(expect.objectContaining({ slug: lab, role: 'viewer' }))
  })

  it('shows the lab to members with their role and counts', async () => {
    const answer = await api(`/api/labs/${lab}`, { cookie: reviewer.cookie })
    expect(answer.status).toBe(200)
    expect(answer.body).toMatchObject({ lab: { slug: lab }, role: 'reviewer', memberCount: 4, systemCount: 0 })
  })

  it('answers 404 to a non-member, the same as for a lab that does not exist', async () => {
    const hidden = await api(`/api/labs/${lab}`, { cookie: outsider.cookie })
    const missing = await api('/api/labs/no-such-lab', { cookie: outsider.cookie })
    expect(hidden.status).toBe(404)
    expect(missing.status).toBe(404)
    expect((await api(`/api/labs/${lab}/members`, { cookie: outsider.cookie })).status).toBe(404)
  })

  it('lets the site administrator see any lab', async () => {
    const admin = await signInAs('admin')
    const answer = await api(`/api/labs/${lab}`, { cookie: admin.cookie })
    expect(answer.status).toBe(200)
    expect(answer.body.role).toBe('owner')
  })

  it('refuses a bad address with 400 and a taken one with 409', async () => {
    const bad = await api('/api/labs', { method: 'POST', cookie: outsider.cookie, body: { name: 'Etch lab', slug: 'Etch Lab!' } })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/lower-case letters, digits and dashes/)
    const taken = await api('/api/labs', { method: 'POST', cookie: outsider.cookie, body: { name: 'Copy', slug: lab } })
    expect(taken.status).toBe(409)
  })
})

describe('members', () => {
  it('lets every member read the member list', async () => {
    const answer = await api(`/api/labs/${lab}/members`, { cookie: viewer.cookie })
    expect(answer.status).toBe(200)
    expect(answer.body.members.map((m: { role: string }) => m.role).sort()).toEqual(['editor', 'owner', 'reviewer', 'viewer'])
  })

  it('lets only the owner add members (403 for the others, with the role needed)', async () => {
    const newcomer = await signUp('newcomer')
    for (const who of [editor, reviewer, viewer]) {
      const refused = await api(`/api/labs/${lab}/members`, { method: 'POST', cookie: who.cookie, body: { email: newcomer.user.email, role: 'viewer' } })
      expect(refused.status).toBe(403)
      expect(refused.body.message).toMatch(/needs the owner role/)
    }
    await joinByInvitation(owner, lab, newcomer, 'reviewer')
    expect((await api(`/api/labs/${lab}`, { cookie: newcomer.cookie })).body.role).toBe('reviewer')
  })

  it('adds people only by invitation, answering alike whether or not the address has an account', async () => {
    const known = await signUp('known')
    const unknownEmail = freshEmail('ghost')
    const toKnown = await api(`/api/labs/${lab}/members`, { method: 'POST', cookie: owner.cookie, body: { email: known.user.email, role: 'viewer' } })
    const toUnknown = await api(`/api/labs/${lab}/members`, { method: 'POST', cookie: owner.cookie, body: { email: unknownEmail, role: 'viewer' } })
    expect(toKnown.status).toBe(201)
    expect(toUnknown.status).toBe(201)
    const shape = (body: { invitation: Record<string, unknown>, mailed: boolean }) => ({
      keys: Object.keys(body).sort(), invitation: Object.keys(body.invitation).sort(), state: body.invitation.state, mailed: body.mailed,
    })
    expect(shape(toKnown.body)).toEqual(shape(toUnknown.body))
    expect(toKnown.body.invitation).toMatchObject({ email: known.user.email, state: 'pending' })
    // Nobody is added without accepting: the existing account is not a member yet.
    expect((await api(`/api/labs/${lab}`, { cookie: known.cookie })).status).toBe(404)
    await waitForMail(unknownEmail, /invites you to/)
    await waitForMail(known.user.email, /invites you to/)
  })

  it('says what to do for a member already there and a bad role', async () => {
    const again = await api(`/api/labs/${lab}/members`, { method: 'POST', cookie: owner.cookie, body: { email: viewer.user.email, role: 'editor' } })
    expect(again.status).toBe(409)
    const badRole = await api(`/api/labs/${lab}/members`, { method: 'POST', cookie: owner.cookie, body: { email: viewer.user.email, role: 'boss' } })
    expect(badRole.status).toBe(400)
    expect(badRole.body.message).toMatch(/viewer, reviewer, editor, owner/)
  })

  it('lets the owner change a role and remove a member; others get 403', async () => {
    const temp = await signUp('temp')
    await joinByInvitation(owner, lab, temp, 'viewer')
    const byEditor = await api(`/api/labs/${lab}/members/${temp.user.id}`, { method: 'PATCH', cookie: editor.cookie, body: { role: 'owner' } })
    expect(byEditor.status).toBe(403)
    const promoted = await api(`/api/labs/${lab}/members/${temp.user.id}`, { method: 'PATCH', cookie: owner.cookie, body: { role: 'editor' } })
    expect(promoted.status).toBe(200)
    expect((await api(`/api/labs/${lab}`, { cookie: temp.cookie })).body.role).toBe('editor')
    expect((await api(`/api/labs/${lab}/members/${temp.user.id}`, { method: 'DELETE', cookie: viewer.cookie })).status).toBe(403)
    expect((await api(`/api/labs/${lab}/members/${temp.user.id}`, { method: 'DELETE', cookie: owner.cookie })).status).toBe(200)
    expect((await api(`/api/labs/${lab}`, { cookie: temp.cookie })).status).toBe(404)
  })

  it('lets a member leave the lab', async () => {
    const leaver = await signUp('leaver')
    const slug = await makeLab(owner, [{ who: leaver, role: 'viewer' }])
    expect((await api(`/api/labs/${slug}/members/${leaver.user.id}`, { method: 'DELETE', cookie: leaver.cookie })).status).toBe(200)
    expect((await api(`/api/labs/${slug}`, { cookie: leaver.cookie })).status).toBe(404)
  })

  it('never leaves a lab without an owner', async () => {
    const solo = await signUp('solo')
    const slug = await makeLab(solo)
    const demote = await api(`/api/labs/${slug}/members/${solo.user.id}`, { method: 'PATCH', cookie: solo.cookie, body: { role: 'editor' } })
    expect(demote.status).toBe(409)
    expect(demote.body.message).toMatch(/at least one owner/)
    const leave = await api(`/api/labs/${slug}/members/${solo.user.id}`, { method: 'DELETE', cookie: solo.cookie })
    expect(leave.status).toBe(409)
    // With a second owner, the first may step down.
    const partner = await signUp('partner')
    await joinByInvitation(solo, slug, partner, 'owner')
    expect((await api(`/api/labs/${slug}/members/${solo.user.id}`, { method: 'PATCH', cookie: solo.cookie, body: { role: 'editor' } })).status).toBe(200)
  })

  it('answers 404 for a user who is not a member and 400 for a user id that is not a number', async () => {
    expect((await api(`/api/labs/${lab}/members/${outsider.user.id}`, { method: 'PATCH', cookie: owner.cookie, body: { role: 'viewer' } })).status).toBe(404)
    const bad = await api(`/api/labs/${lab}/members/abc`, { method: 'DELETE', cookie: owner.cookie })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^User must be a number/)
  })
})
