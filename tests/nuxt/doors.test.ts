// The doors around the routes: mail links on the configured site origin, body
// limits counted as bodies stream in, cross-origin and non-JSON writes refused,
// security headers, changes that commit with their audit line or not at all,
// 503 when the database connection is lost, and the last-owner lock.
import { request } from 'node:http'
import { describe, expect, it } from 'vitest'
import mysql from 'mysql2/promise'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { TEST_DATABASE_URL } from '../setup/test-database'
import { api, makeLab, siteOrigin, signUp, type SignedIn } from '../setup/accounts'
import { waitForMail } from '../setup/mail'
import { BODY_LIMITS, byteLabel } from '../../server/utils/request-limits'
import { DATABASE_UNAVAILABLE_MESSAGE } from '../../server/database/unavailable'

await useBuiltServer()

interface RawAnswer { status: number, headers: Record<string, string | string[] | undefined>, body: any }

/**
 * One request over node:http, which (unlike fetch) lets a test forge Host and
 * send a chunked body. `chunks` are written one by one without Content-Length.
 * Resolves with the answer even when the server stops reading early.
 */
function raw(path: string, options: { method?: string, headers?: Record<string, string>, body?: string | Buffer, chunks?: Buffer[] } = {}): Promise<RawAnswer> {
  const target = new URL(url(path))
  return new Promise((resolve, reject) => {
    const req = request({ host: target.hostname, port: target.port, path: target.pathname + target.search, method: options.method ?? 'GET', headers: options.headers }, (res) => {
      const parts: Buffer[] = []
      res.on('data', (c: Buffer) => parts.push(c))
      res.on('end', () => {
        const text = Buffer.concat(parts).toString('utf8')
        let body: unknown = text
        try { body = JSON.parse(text) } catch { /* not JSON */ }
        resolve({ status: res.statusCode ?? 0, headers: res.headers, body })
      })
    })
    // The server may answer and close before the whole body is written; the answer is what counts.
    req.on('error', (error) => setTimeout(() => reject(error), 2000))
    if (options.chunks) {
      for (const chunk of options.chunks) req.write(chunk)
      req.end()
    } else {
      req.end(options.body)
    }
  })
}

const db = await mysql.createConnection({ uri: TEST_DATABASE_URL })

async function newSystem(owner: SignedIn, lab: string, slug = 'tank'): Promise<void> {
  const created = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Tank', slug } })
  expect(created.status).toBe(201)
}

describe('links in mail', () => {
  it('use the configured site origin, whatever Host the request names', async () => {
    const me = await signUp('forged-host')
    const answer = await raw('/api/auth/password/forgot', {
      method: 'POST',
      headers: { host: 'evil.example', 'content-type': 'application/json' },
      body: JSON.stringify({ email: me.user.email }),
    })
    expect(answer.status).toBe(202)
    const mail = await waitForMail(me.user.email, /new password/)
    expect(mail.text).toContain(`${siteOrigin()}/password/reset?token=`)
    expect(mail.text).not.toContain('evil.example')
  })
})

describe('request body limits', () => {
  it('refuses a body over the signed-in limit with 413 naming it, and keeps nothing', async () => {
    const owner = await signUp('big-body')
    const lab = await makeLab(owner)
    await newSystem(owner, lab)
    const big = JSON.stringify({ source: 'x'.repeat(BODY_LIMITS.signedInBytes + 1000), message: 'too big', baseRevision: 1 })
    const answer = await raw(`/api/labs/${lab}/systems/tank`, {
      method: 'PATCH',
      headers: { cookie: owner.cookie, 'content-type': 'application/json', 'content-length': String(Buffer.byteLength(big)) },
      body: big,
    })
    expect(answer.status).toBe(413)
    expect(answer.body.message).toContain(`larger than ${byteLabel(BODY_LIMITS.signedInBytes)}`)
    expect((await api(`/api/labs/${lab}/systems/tank/revisions`, { cookie: owner.cookie })).body.revisions).toHaveLength(1)
  })

  it('counts a chunked body (no Content-Length) as it streams in', async () => {
    const owner = await signUp('chunked')
    const lab = await makeLab(owner)
    await newSystem(owner, lab)
    const piece = Buffer.from('x'.repeat(64 * 1024))
    const pieces = Math.ceil(BODY_LIMITS.signedInBytes / piece.length) + 2
    const chunks = [Buffer.from('{"message":"chunked","baseRevision":1,"source":"'), ...Array.from({ length: pieces }, () => piece), Buffer.from('"}')]
    const answer = await raw(`/api/labs/${lab}/systems/tank`, { method: 'PATCH', headers: { cookie: owner.cookie, 'content-type': 'application/json' }, chunks })
    expect(answer.status).toBe(413)
    expect(answer.body.message).toContain(byteLabel(BODY_LIMITS.signedInBytes))
    expect((await api(`/api/labs/${lab}/systems/tank/revisions`, { cookie: owner.cookie })).body.revisions).toHaveLength(1)

    // Within the limit a chunked body reaches the route whole.
    const small = JSON.stringify({ source: 'system "Chunked"\n', message: 'in pieces', baseRevision: 1 })
    const fine = await raw(`/api/labs/${lab}/systems/tank`, {
      method: 'PATCH',
      headers: { cookie: owner.cookie, 'content-type': 'application/json' },
      chunks: [Buffer.from(small.slice(0, 10)), Buffer.from(small.slice(10))],
    })
    expect(fine.status).toBe(200)
    expect(fine.body.system.latest).toMatchObject({ number: 2, message: 'in pieces' })
  })

  it('holds anonymous requests to a tighter limit, Content-Length or chunked', async () => {
    expect(BODY_LIMITS.anonymousBytes).toBeLessThan(BODY_LIMITS.signedInBytes)
    const padded = JSON.stringify({ email: 'someone@tests.equipoise.test', name: 'x'.repeat(BODY_LIMITS.anonymousBytes), password: 'a long enough password' })
    const declared = await raw('/api/auth/register', { method: 'POST', headers: { 'content-type': 'application/json', 'content-length': String(Buffer.byteLength(padded)) }, body: padded })
    expect(declared.status).toBe(413)
    expect(declared.body.message).toContain(`larger than ${byteLabel(BODY_LIMITS.anonymousBytes)}, the most accepted without signing in`)
    const chunked = await raw('/api/auth/login', { method: 'POST', headers: { 'content-type': 'application/json' }, chunks: [Buffer.from(padded.slice(0, 100)), Buffer.from(padded.slice(100))] })
    expect(chunked.status).toBe(413)
    expect(chunked.body.message).toContain(byteLabel(BODY_LIMITS.anonymousBytes))

    // The same body from a signed-in account is under its limit: the route answers (here: name too long).
    const someone = await signUp('padded')
    const labAnswer = await api('/api/labs', { method: 'POST', cookie: someone.cookie, body: { name: 'x'.repeat(BODY_LIMITS.anonymousBytes), slug: 'padded-lab' } })
    expect(labAnswer.status).toBe(400)
    expect(labAnswer.body.message).toBe('Use at most 120 characters')
    expect(labAnswer.body.data.issues[0].path).toBe('name')
  })
})

describe('cross-origin and non-JSON writes', () => {
  it('refuses a write whose Origin or Referer is another site, changing nothing', async () => {
    const owner = await signUp('csrf')
    const lab = await makeLab(owner)
    await newSystem(owner, lab)
    const rename = { title: 'Renamed from elsewhere' }
    const fromEvil = await api(`/api/labs/${lab}/systems/tank`, { method: 'PATCH', cookie: owner.cookie, body: rename, headers: { origin: 'http://evil.example' } })
    expect(fromEvil.status).toBe(403)
    expect(fromEvil.body.message).toContain(`sent from http://evil.example, not from ${siteOrigin()}`)
    const nullOrigin = await api(`/api/labs/${lab}/systems/tank`, { method: 'PATCH', cookie: owner.cookie, body: rename, headers: { origin: 'null' } })
    expect(nullOrigin.status).toBe(403)
    const byReferer = await raw(`/api/labs/${lab}/systems/tank`, {
      method: 'PATCH',
      headers: { cookie: owner.cookie, 'content-type': 'application/json', referer: 'http://evil.example/page' },
      body: JSON.stringify(rename),
    })
    expect(byReferer.status).toBe(403)
    const removed = await api(`/api/labs/${lab}/systems/tank`, { method: 'DELETE', cookie: owner.cookie, headers: { origin: 'http://evil.example' } })
    expect(removed.status).toBe(403)
    expect((await api(`/api/labs/${lab}/systems/tank`, { cookie: owner.cookie })).body.system.title).toBe('Tank')

    // Reads are not refused; and a script that sends neither header (no browser, no borrowed cookie) may write.
    expect((await api(`/api/labs/${lab}/systems/tank`, { cookie: owner.cookie, headers: { origin: 'http://evil.example' } })).status).toBe(200)
    const script = await raw(`/api/labs/${lab}/systems/tank`, { method: 'PATCH', headers: { cookie: owner.cookie, 'content-type': 'application/json' }, body: JSON.stringify({ title: 'Renamed by a script' }) })
    expect(script.status).toBe(200)
  })

  it('refuses a form-encoded or plain-text write with 415 saying to send JSON', async () => {
    const someone = await signUp('form-post')
    const form = await raw('/api/labs', {
      method: 'POST',
      headers: { cookie: someone.cookie, origin: siteOrigin(), 'content-type': 'application/x-www-form-urlencoded' },
      body: 'name=Form+lab&slug=form-lab',
    })
    expect(form.status).toBe(415)
    expect(form.body.message).toBe('Send the request body as JSON (Content-Type: application/json), not application/x-www-form-urlencoded')
    const text = await raw('/api/labs', {
      method: 'POST',
      headers: { cookie: someone.cookie, origin: siteOrigin(), 'content-type': 'text/plain' },
      body: JSON.stringify({ name: 'Text lab', slug: 'text-lab' }),
    })
    expect(text.status).toBe(415)
    expect((await api('/api/labs', { cookie: someone.cookie })).body.labs).toEqual([])
  })
})

describe('security headers', () => {
  function expectHardened(headers: Headers) {
    expect(headers.get('x-content-type-options')).toBe('nosniff')
    expect(headers.get('x-frame-options')).toBe('DENY')
    expect(headers.get('referrer-policy')).toBe('same-origin')
    expect(headers.get('x-powered-by')).toBeNull()
  }

  function expectPolicy(headers: Headers): string {
    const csp = headers.get('content-security-policy') ?? ''
    expect(csp).toContain("frame-ancestors 'none'")
    expect(csp).toContain("object-src 'none'")
    expect(csp).not.toContain('unsafe-eval')
    return csp
  }

  it('sends them on a page, with a nonce on every script of it', async () => {
    const page = await fetch(url('/login'))
    expect(page.status).toBe(200)
    expectHardened(page.headers)
    const csp = expectPolicy(page.headers)
    const nonce = /script-src [^;]*'nonce-([^']+)'/.exec(csp)?.[1]
    expect(nonce).toBeTruthy()
    expect(csp).not.toMatch(/script-src [^;]*'unsafe-inline'/)
    const html = await page.text()
    const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]).filter((tag) => !/type="application\/json"/.test(tag))
    expect(scripts.length).toBeGreaterThan(0)
    for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`)
    // A new nonce for every page served.
    const again = await fetch(url('/login'))
    expect(/'nonce-([^']+)'/.exec(again.headers.get('content-security-policy') ?? '')?.[1]).not.toBe(nonce)
  })

  it('sends them on an API answer, and error answers are no less strict', async () => {
    const me = await signUp('headers')
    const answer = await fetch(url('/api/me'), { headers: { cookie: me.cookie } })
    expect(answer.status).toBe(200)
    expectHardened(answer.headers)
    const refused = await fetch(url('/api/me'))
    expect(refused.status).toBe(401)
    expect(refused.headers.get('x-content-type-options')).toBe('nosniff')
    expect(refused.headers.get('x-frame-options')).toBe('DENY')
    expect(refused.headers.get('x-powered-by')).toBeNull()
  })
})

describe('changes and their audit line', () => {
  it('commit together or not at all when the database connection drops mid-save', async () => {
    const owner = await signUp('atomic')
    const lab = await makeLab(owner)
    await newSystem(owner, lab)
    const [[{ n: before }]] = await db.query('SELECT COUNT(*) AS n FROM audit_log') as any

    // Hold the audit table: the save writes its revision, then waits on the audit line.
    const locker = await mysql.createConnection({ uri: TEST_DATABASE_URL })
    await locker.query('LOCK TABLES audit_log WRITE')
    const saving = api(`/api/labs/${lab}/systems/tank`, { method: 'PATCH', cookie: owner.cookie, body: { source: 'system "Lost"\n', message: 'mid-save', baseRevision: 1 } })
    let waiting: { id: number } | undefined
    for (let tries = 0; tries < 100 && !waiting; tries++) {
      await new Promise((r) => setTimeout(r, 50))
      const [rows] = await db.query("SELECT ID AS id FROM information_schema.PROCESSLIST WHERE INFO LIKE 'insert into `audit_log`%'") as any
      waiting = rows[0]
    }
    expect(waiting, 'the save never reached its audit line').toBeDefined()
    // The database loses the save's connection while the revision is written and the audit line is not.
    await db.query(`KILL CONNECTION ${waiting!.id}`)
    await locker.query('UNLOCK TABLES')
    await locker.end()

    const answer = await saving
    expect(answer.status).toBe(503)
    expect(answer.body.message).toBe(DATABASE_UNAVAILABLE_MESSAGE)
    const [revisions] = await db.query('SELECT r.number FROM revisions r JOIN systems s ON s.id = r.system_id JOIN labs l ON l.id = s.lab_id WHERE l.slug = ? ORDER BY r.number', [lab]) as any
    expect(revisions.map((r: { number: number }) => r.number)).toEqual([1])
    const [[{ n: after }]] = await db.query('SELECT COUNT(*) AS n FROM audit_log') as any
    expect(Number(after)).toBe(Number(before))

    // The server recovers by itself: the next save goes through with its audit line.
    const retry = await api(`/api/labs/${lab}/systems/tank`, { method: 'PATCH', cookie: owner.cookie, body: { source: 'system "Kept"\n', message: 'retry', baseRevision: 1 } })
    expect(retry.status).toBe(200)
    expect(retry.body.system.latest.number).toBe(2)
    const [audit] = await db.query("SELECT action, detail FROM audit_log WHERE action = 'system.revise' AND JSON_VALUE(detail, '$.slug') = 'tank' AND actor_id = ?", [owner.user.id]) as any
    expect(audit).toHaveLength(1)
  })

  it('refuses an import with a 70,000-character file name before writing anything', async () => {
    const owner = await signUp('long-name')
    const lab = await makeLab(owner)
    const form = new FormData()
    form.append('file', new Blob(['system "Long"\n']), `${'n'.repeat(70_000)}.poise`)
    const response = await fetch(url(`/api/labs/${lab}/imports`), { method: 'POST', headers: { cookie: owner.cookie, origin: siteOrigin() }, body: form })
    expect(response.status).toBe(400)
    const refused = await response.json()
    expect(refused.message).toMatch(/^The file name is longer than 255 characters; rename the file/)
    expect(refused.data.issues[0].path).toBe('file')
    expect((await api(`/api/labs/${lab}/systems`, { cookie: owner.cookie })).body.systems).toEqual([])
  })
})

describe('the last owner', () => {
  it('stays when two owners remove each other at the same moment', async () => {
    for (let round = 0; round < 3; round++) {
      const first = await signUp('owner-a')
      const second = await signUp('owner-b')
      const lab = await makeLab(first, [{ who: second, role: 'owner' }])
      const answers = await Promise.all([
        api(`/api/labs/${lab}/members/${second.user.id}`, { method: 'DELETE', cookie: first.cookie }),
        api(`/api/labs/${lab}/members/${first.user.id}`, { method: 'DELETE', cookie: second.cookie }),
      ])
      const statuses = answers.map((a) => a.status).sort()
      // One removal wins; the other either finds the lab with one owner (409) or finds itself removed already (404).
      expect(statuses[0]).toBe(200)
      expect([404, 409]).toContain(statuses[1])
      const [owners] = await db.query("SELECT m.user_id FROM lab_members m JOIN labs l ON l.id = m.lab_id WHERE l.slug = ? AND m.role = 'owner'", [lab]) as any
      expect(owners).toHaveLength(1)
    }
  })

  it('stays when one owner steps down while the other is removed', async () => {
    const first = await signUp('owner-c')
    const second = await signUp('owner-d')
    const lab = await makeLab(first, [{ who: second, role: 'owner' }])
    await Promise.all([
      api(`/api/labs/${lab}/members/${first.user.id}`, { method: 'PATCH', cookie: first.cookie, body: { role: 'editor' } }),
      api(`/api/labs/${lab}/members/${second.user.id}`, { method: 'PATCH', cookie: second.cookie, body: { role: 'viewer' } }),
    ])
    const [owners] = await db.query("SELECT m.user_id FROM lab_members m JOIN labs l ON l.id = m.lab_id WHERE l.slug = ? AND m.role = 'owner'", [lab]) as any
    expect(owners).toHaveLength(1)
  })
})
