// Invitations by e-mail: the mail arrives at the fake SMTP server, its link
// works once, for the invited address only, and not after it expires.
import { describe, expect, it } from 'vitest'
import mysql from 'mysql2/promise'
import { useBuiltServer } from '../setup/server'
import { api, freshEmail, makeLab, sessionCookie, signUp } from '../setup/accounts'
import { linkTo, waitForMail } from '../setup/mail'
import { TEST_DATABASE_URL } from '../setup/test-database'
import { INVITATIONS_PER_HOUR } from '../../server/utils/limits'

await useBuiltServer()

function tokenOf(link: string): string {
  return new URL(link, 'http://x').searchParams.get('token') ?? ''
}

async function invite(owner: { cookie: string }, lab: string, email: string, role: string) {
  const answer = await api(`/api/labs/${lab}/invitations`, { method: 'POST', cookie: owner.cookie, body: { email, role } })
  expect(answer.status).toBe(201)
  expect(answer.body.mailed).toBe(true)
  const mail = await waitForMail(email, /invites you to/)
  return { id: answer.body.invitation.id as number, mail, link: linkTo(mail, '/invitations/accept') }
}

async function membersOf(lab: string, cookie: string): Promise<Array<{ email: string, role: string }>> {
  const answer = await api(`/api/labs/${lab}/members`, { cookie })
  return answer.body.members
}

describe('invitations', () => {
  it('mails a link that lets a signed-in account with that address join with the role', async () => {
    const owner = await signUp('owner')
    const guest = await signUp('guest')
    const lab = await makeLab(owner)
    const { mail, link } = await invite(owner, lab, guest.user.email, 'reviewer')
    expect(mail.subject).toContain(`Lab ${lab}`)
    expect(mail.text).toContain('as reviewer')

    const page = await api(link)
    expect(page.status).toBe(200)
    const offer = await api(`/api/invitations/${tokenOf(link)}`)
    expect(offer.body).toMatchObject({ email: guest.user.email, role: 'reviewer', lab: { slug: lab } })

    const accepted = await api('/api/invitations/accept', { method: 'POST', cookie: guest.cookie, body: { token: tokenOf(link) } })
    expect(accepted.status).toBe(200)
    expect(accepted.body).toMatchObject({ lab: { slug: lab }, role: 'reviewer' })
    expect(await membersOf(lab, owner.cookie)).toContainEqual(expect.objectContaining({ email: guest.user.email, role: 'reviewer' }))
  })

  it('lets a new address create its account from the link and join', async () => {
    const owner = await signUp('owner')
    const lab = await makeLab(owner)
    const email = freshEmail('newcomer')
    const { link } = await invite(owner, lab, email, 'editor')
    // The link's page does not say whether the address has an account: the same keys as for one that has.
    const offer = await api(`/api/invitations/${tokenOf(link)}`)
    expect(Object.keys(offer.body).sort()).toEqual(['email', 'expiresAt', 'invitedBy', 'lab', 'role'])

    const joined = await api('/api/invitations/register', { method: 'POST', body: { token: tokenOf(link), name: 'New Comer', password: 'a long enough password' } })
    expect(joined.status).toBe(201)
    expect(joined.body.user.email).toBe(email)
    const cookie = sessionCookie(joined.headers)
    const labPage = await api(`/api/labs/${lab}`, { cookie })
    expect(labPage.status).toBe(200)
    expect(await membersOf(lab, owner.cookie)).toContainEqual(expect.objectContaining({ email, role: 'editor' }))
  })

  it('refuses a link used once already, saying it works once', async () => {
    const owner = await signUp('owner')
    const guest = await signUp('guest')
    const lab = await makeLab(owner)
    const { link } = await invite(owner, lab, guest.user.email, 'viewer')
    const token = tokenOf(link)
    expect((await api('/api/invitations/accept', { method: 'POST', cookie: guest.cookie, body: { token } })).status).toBe(200)

    const again = await api('/api/invitations/accept', { method: 'POST', cookie: guest.cookie, body: { token } })
    expect(again.status).toBe(410)
    expect(again.body.message).toMatch(/already used.*works once/)
    const lookup = await api(`/api/invitations/${token}`)
    expect(lookup.status).toBe(410)
    const register = await api('/api/invitations/register', { method: 'POST', body: { token, name: 'X', password: 'a long enough password' } })
    expect(register.status).toBe(410)
  })

  it('refuses an expired link, saying when it expired and whom to ask', async () => {
    const owner = await signUp('owner')
    const guest = await signUp('guest')
    const lab = await makeLab(owner)
    const { id, link } = await invite(owner, lab, guest.user.email, 'editor')
    const connection = await mysql.createConnection(TEST_DATABASE_URL)
    await connection.query('UPDATE invitations SET expires_at = NOW(3) - INTERVAL 1 DAY WHERE id = ?', [id])
    await connection.end()

    const answer = await api('/api/invitations/accept', { method: 'POST', cookie: guest.cookie, body: { token: tokenOf(link) } })
    expect(answer.status).toBe(410)
    expect(answer.body.message).toMatch(/expired on .*ask Test owner to invite you again/)
    expect(await membersOf(lab, owner.cookie)).not.toContainEqual(expect.objectContaining({ email: guest.user.email }))
  })

  it('does not let another account use a forwarded link', async () => {
    const owner = await signUp('owner')
    const guest = await signUp('guest')
    const other = await signUp('other')
    const lab = await makeLab(owner)
    const { link } = await invite(owner, lab, guest.user.email, 'owner')
    const answer = await api('/api/invitations/accept', { method: 'POST', cookie: other.cookie, body: { token: tokenOf(link) } })
    expect(answer.status).toBe(403)
    expect(answer.body.message).toContain(`This invitation is for ${guest.user.email}`)
    // The link is still good for the person it was meant for.
    expect((await api('/api/invitations/accept', { method: 'POST', cookie: guest.cookie, body: { token: tokenOf(link) } })).status).toBe(200)
  })

  it('is for owners only, refuses inviting a member twice, and a withdrawn link stops working', async () => {
    const owner = await signUp('owner')
    const editor = await signUp('editor')
    const lab = await makeLab(owner, [{ who: editor, role: 'editor' }])
    const byEditor = await api(`/api/labs/${lab}/invitations`, { method: 'POST', cookie: editor.cookie, body: { email: freshEmail('x'), role: 'viewer' } })
    expect(byEditor.status).toBe(403)
    const member = await api(`/api/labs/${lab}/invitations`, { method: 'POST', cookie: owner.cookie, body: { email: editor.user.email, role: 'owner' } })
    expect(member.status).toBe(409)
    expect(member.body.message).toMatch(/already a member \(editor\)/)
    const badRole = await api(`/api/labs/${lab}/invitations`, { method: 'POST', cookie: owner.cookie, body: { email: freshEmail('x'), role: 'boss' } })
    expect(badRole.status).toBe(400)

    const email = freshEmail('withdrawn')
    const { id, link } = await invite(owner, lab, email, 'viewer')
    const list = await api(`/api/labs/${lab}/invitations`, { cookie: owner.cookie })
    expect(list.body.invitations).toContainEqual(expect.objectContaining({ id, email, state: 'pending' }))
    expect((await api(`/api/labs/${lab}/invitations/${id}`, { method: 'DELETE', cookie: owner.cookie })).status).toBe(200)
    expect((await api(`/api/invitations/${tokenOf(link)}`)).status).toBe(404)
  })

  it('limits invitations per person and per lab in an hour, with a 429 saying when to try again', async () => {
    const owner = await signUp('busy')
    const partner = await signUp('partner')
    const lab = await makeLab(owner, [{ who: partner, role: 'owner' }])
    const send = (who: { cookie: string }, slug: string) =>
      api(`/api/labs/${slug}/invitations`, { method: 'POST', cookie: who.cookie, body: { email: freshEmail('spam'), role: 'viewer' } })
    // makeLab sent one already; the lab takes INVITATIONS_PER_HOUR.perLab in all.
    let last = 0
    for (let i = 1; i < INVITATIONS_PER_HOUR.perLab; i++) {
      const sent = await send(owner, lab)
      expect(sent.status).toBe(201)
      last = sent.body.invitation.id
    }
    // Withdrawing one does not make room: it was sent.
    expect((await api(`/api/labs/${lab}/invitations/${last}`, { method: 'DELETE', cookie: owner.cookie })).status).toBe(200)
    const labFull = await send(partner, lab)
    expect(labFull.status).toBe(429)
    expect(labFull.body.message).toMatch(new RegExp(`^Lab ${lab} has sent ${INVITATIONS_PER_HOUR.perLab} invitations in the last hour.* Try again in \\d+ minutes \\(after \\d\\d:\\d\\d UTC\\)\\.$`))
    const wait = Number(labFull.headers.get('retry-after'))
    expect(wait).toBeGreaterThan(3500)
    expect(wait).toBeLessThanOrEqual(3600)

    // The partner may still invite into another lab; the owner, who sent the lab's 20, may not.
    const other = await makeLab(partner)
    expect((await send(partner, other)).status).toBe(201)
    const ownerFull = await send(owner, await makeLab(owner))
    expect(ownerFull.status).toBe(429)
    expect(ownerFull.body.message).toMatch(/^You have sent 20 invitations in the last hour/)
    // Adding a member is an invitation, and counts the same.
    const viaMembers = await api(`/api/labs/${lab}/members`, { method: 'POST', cookie: partner.cookie, body: { email: freshEmail('x'), role: 'viewer' } })
    expect(viaMembers.status).toBe(429)
  })
})
