// The fake SMTP server must hand back exactly what the app sent: the tests
// follow links out of captured mail, so a mangled "=" or a lost line break
// would break every mail test in a way that is hard to read.
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createTransport } from 'nodemailer'
import { readMessage, startFakeSmtp } from '../../../scripts/fake-smtp.mjs'

let server: { port: number; dir: string; close: () => Promise<void> }
const dir = mkdtempSync(join(tmpdir(), 'equipoise-mail-'))

beforeAll(async () => {
  server = await startFakeSmtp({ dir })
})

afterAll(async () => {
  await server.close()
  rmSync(dir, { recursive: true, force: true })
})

function captured(): Array<Record<string, unknown>> {
  return readdirSync(dir).sort().map((name) => JSON.parse(readFileSync(join(dir, name), 'utf8')))
}

describe('fake SMTP server', () => {
  it('keeps subject, text and html of a message as they were sent, links intact', async () => {
    const link = 'http://localhost:3000/invitations/accept?token=' + 'Ab3_-'.repeat(12) + '&from=mail'
    const text = `You are invited to the Ca²⁺ rinse-tank lab.\n\nOpen ${link}\nwithin 7 days.`
    const html = `<p>You are invited to the <b>Ca²⁺</b> lab: <a href="${link}">accept</a></p>`
    await createTransport({ host: '127.0.0.1', port: server.port, ignoreTLS: true })
      .sendMail({ from: 'Equipoise <no-reply@equipoise.invalid>', to: 'chemist@example.org', subject: 'Join the Ca²⁺ lab — Equipoise', text, html })

    const [message] = captured()
    expect(message).toMatchObject({
      from: 'no-reply@equipoise.invalid',
      to: ['chemist@example.org'],
      subject: 'Join the Ca²⁺ lab — Equipoise',
      text,
      html,
    })
  })

  it('joins long quoted-printable lines again and stores a text-only mail without html', async () => {
    const text = `Reset your password: http://localhost:3000/password/reset?token=${'x9='.repeat(60)}\n\n— Equipoise`
    await createTransport({ host: '127.0.0.1', port: server.port, ignoreTLS: true })
      .sendMail({ from: 'no-reply@equipoise.invalid', to: ['a@example.org', 'b@example.org'], subject: 'Reset', text })

    const message = captured().find((m) => m.subject === 'Reset')
    expect(message).toMatchObject({ to: ['a@example.org', 'b@example.org'], text, html: null })
  })

  it('decodes base64 parts and encoded-word subjects from other mail programs too', () => {
    const text = 'Neue Einladung: Zn²⁺-Bad'
    const raw = [
      'Subject: =?UTF-8?B?' + Buffer.from('Zn²⁺ bath').toString('base64') + '?= =?UTF-8?Q?_=E2=80=94_invite?=',
      'Content-Type: multipart/alternative; boundary="b1"',
      '',
      '--b1',
      'Content-Type: text/plain; charset=utf-8',
      'Content-Transfer-Encoding: base64',
      '',
      Buffer.from(text).toString('base64'),
      '--b1',
      'Content-Type: text/html; charset=utf-8',
      'Content-Transfer-Encoding: quoted-printable',
      '',
      '<p>Zn=C2=B2=E2=81=BA-Bad</p>',
      '--b1--',
      '',
    ].join('\r\n')
    expect(readMessage(Buffer.from(raw, 'utf8').toString('latin1'), { from: 'a@example.org', to: ['b@example.org'] })).toEqual({
      from: 'a@example.org',
      to: ['b@example.org'],
      subject: 'Zn²⁺ bath — invite',
      text,
      html: '<p>Zn²⁺-Bad</p>',
    })
  })
})
