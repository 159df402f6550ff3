/**
 * Data sets and fitting through the API: an editor uploads a CSV (a file
 * with mistakes is refused whole, naming line and column), viewers list and
 * read it and fit with it, an editor applies the fit as the next revision
 * (value ± standard error and a citation of the data set) and deletes it;
 * the audit log has each write. Data (tests/fixtures/fit.ts) made from pKa 4.76 with a
 * fixed alternating error of ±0.005.
 */
import mysql from 'mysql2/promise'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { TEST_DATABASE_URL } from '../setup/test-database'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { compile } from '../../shared/poise/index'
import { WEAK_ACID_CSV, weakAcidTitration } from '../fixtures/fit'

await useBuiltServer()

const acid = weakAcidTitration
const CSV = WEAK_ACID_CSV

let owner: SignedIn
let editor: SignedIn
let viewer: SignedIn
let outsider: SignedIn
let lab: string
let db: mysql.Connection
const system = 'weak-acid'
const base = () => `/api/labs/${lab}/systems/${system}/datasets`

async function upload(who: SignedIn, name: string, text: string, fields: Record<string, string> = {}) {
  const form = new FormData()
  form.append('file', new Blob([text]), name)
  for (const [key, value] of Object.entries(fields)) form.append(key, value)
  const response = await fetch(url(base()), { method: 'POST', headers: { cookie: who.cookie, accept: 'application/json' }, body: form })
  return { status: response.status, body: await response.json() }
}

beforeAll(async () => {
  owner = await signUp('owner')
  ;[editor, viewer, outsider] = await Promise.all([signUp('editor'), signUp('viewer'), signUp('outsider')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: viewer, role: 'viewer' }])
  const made = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Weak acid', slug: system, source: acid('4.40 fit') } })
  expect(made.status).toBe(201)
  db = await mysql.createConnection(TEST_DATABASE_URL)
})
afterAll(async () => { await db?.end() })

async function audit(action: string): Promise<Record<string, unknown>[]> {
  const [rows] = await db.query('SELECT detail FROM audit_log WHERE action = ? AND lab_id = (SELECT id FROM labs WHERE slug = ?) AND JSON_VALUE(detail, \'$.slug\') = ? ORDER BY id', [action, lab, system])
  return (rows as { detail: string }[]).map((r) => JSON.parse(r.detail))
}

describe('data sets', () => {
  let id: number

  it('lets an editor upload a CSV, stored with its columns, rows, author and SHA-256', async () => {
    const answer = await upload(editor, 'titration-1.csv', CSV)
    expect(answer.status).toBe(201)
    expect(answer.body.dataset).toMatchObject({ name: 'titration-1', filename: 'titration-1.csv', columns: ['volume mL', 'pH'], rowCount: 20, createdBy: editor.user.name })
    expect(answer.body.dataset.sha256).toMatch(/^[0-9a-f]{64}$/)
    id = answer.body.dataset.id
    expect(await audit('dataset.upload')).toEqual([expect.objectContaining({ dataset: id, name: 'titration-1', rows: 20 })])
    const again = await upload(editor, 'titration-1.csv', CSV)
    expect(again.status).toBe(409)
    expect(again.body.message).toMatch(/already has a data set named "titration-1"/)
  })

  it('refuses a file with mistakes whole, naming each line and column', async () => {
    const answer = await upload(editor, 'bad.csv', 'volume mL,pH,Cu++ mg\n0,3.1,1\n1,3;2,1\n', { name: 'bad one' })
    expect(answer.status).toBe(400)
    expect(answer.body.message).toMatch(/^The file was not stored: 2 problems, the first at line 1, column 3 \(Cu\+\+ mg\): /)
    expect(answer.body.data.problems.map((p: { line: number; column: number }) => [p.line, p.column])).toEqual([[1, 3], [3, 2]])
    const listed = await api(base(), { cookie: editor.cookie })
    expect(listed.body.datasets.map((d: { name: string }) => d.name)).toEqual(['titration-1'])
    const wrongKind = await upload(editor, 'data.xlsx', CSV)
    expect(wrongKind.status).toBe(415)
  })

  it('lets a viewer list and read it, and refuses a viewer\'s upload and an outsider', async () => {
    const listed = await api(base(), { cookie: viewer.cookie })
    expect(listed.status).toBe(200)
    expect(listed.body.datasets).toHaveLength(1)
    const one = await api(`${base()}/${id}`, { cookie: viewer.cookie })
    expect(one.status).toBe(200)
    expect(one.body.dataset.rows).toHaveLength(20)
    expect(one.body.dataset.rows[0]).toEqual([0.3, expect.any(Number)])
    expect((await upload(viewer, 'v.csv', CSV)).status).toBe(403)
    expect((await api(base(), { cookie: outsider.cookie })).status).toBe(404)
    expect((await api(`${base()}/999999`, { cookie: viewer.cookie })).status).toBe(404)
  })

  it('fits for a viewer and stores nothing', async () => {
    const answer = await api(`${base()}/${id}/fit`, { method: 'POST', cookie: viewer.cookie, body: {} })
    expect(answer.status).toBe(200)
    expect(answer.body.revision).toBe(1)
    const fit = answer.body.fit
    expect(fit).toMatchObject({ converged: true, points: 20, degreesOfFreedom: 19 })
    expect(fit.constants[0]).toMatchObject({ reaction: 'CH3COOH <=> CH3COO- + H+', kind: 'pKa' })
    expect(Math.abs(fit.constants[0].value - 4.76)).toBeLessThan(3 * fit.constants[0].standardError)
    expect(fit.columns[0].residual).toHaveLength(20)
    // A weight of 2 on the one column doubles the weighted residuals, and so s, and moves nothing else.
    const weighted = await api(`${base()}/${id}/fit`, { method: 'POST', cookie: viewer.cookie, body: { weights: { pH: 2 } } })
    expect(weighted.status).toBe(200)
    expect(weighted.body.fit.residualStandardDeviation / fit.residualStandardDeviation).toBeCloseTo(2, 3)
    expect(weighted.body.fit.constants[0].value).toBeCloseTo(fit.constants[0].value, 4)
    expect(weighted.body.fit.columns[0].weight).toBe(2)
    const badWeight = await api(`${base()}/${id}/fit`, { method: 'POST', cookie: viewer.cookie, body: { weights: { pH: -1 } } })
    expect(badWeight.status).toBe(400)
    expect(badWeight.body.message).toBe('A weight must be above 0')
    const revisions = await api(`/api/labs/${lab}/systems/${system}/revisions`, { cookie: viewer.cookie })
    expect(revisions.body.revisions).toHaveLength(1)
  })

  it('says what to change when the fit cannot run: a column the model cannot predict', async () => {
    const other = await upload(editor, 'copper.csv', 'volume mL,pH,Cu^2+ mol/L\n1,4.2,1e-3\n2,4.5,1e-3\n')
    expect(other.status).toBe(201)
    const answer = await api(`${base()}/${other.body.dataset.id}/fit`, { method: 'POST', cookie: viewer.cookie, body: {} })
    expect(answer.status).toBe(422)
    expect(answer.body.message).toMatch(/^Column 3 \(Cu\^2\+ mol\/L\): the model has no species Cu\^2\+/)
  })

  it('applies the fit for an editor: the next revision carries value ± standard error and cites the data set', async () => {
    const [row] = (await db.query('SELECT sha256 FROM datasets WHERE id = ?', [id]))[0] as { sha256: string }[]
    expect((await api(`${base()}/${id}/apply`, { method: 'POST', cookie: viewer.cookie, body: { baseRevision: 1 } })).status).toBe(403)
    expect((await api(`${base()}/${id}/apply`, { method: 'POST', cookie: editor.cookie, body: { baseRevision: 7 } })).status).toBe(409)
    const answer = await api(`${base()}/${id}/apply`, { method: 'POST', cookie: editor.cookie, body: { baseRevision: 1 } })
    expect(answer.status).toBe(201)
    expect(answer.body.revision.number).toBe(2)
    expect(answer.body.revision.message).toBe('Fitted pKa of CH3COOH <=> CH3COO- + H+ to data set titration-1')
    const line = (answer.body.revision.source as string).split('\n').find((l) => l.startsWith('reaction CH3COOH'))!
    expect(line).toMatch(new RegExp(`^reaction CH3COOH <=> CH3COO- \\+ H\\+   pKa 4\\.7\\d+ ± 0\\.0\\d+ fit   cite "fitted to data set titration-1 \\(sha256 ${row!.sha256}\\)"$`))
    const compiled = compile(answer.body.revision.source)
    expect(compiled.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
    const reaction = compiled.model!.reactions.find((r) => r.defines === 'CH3COOH')!
    expect(reaction).toMatchObject({ fit: true, cite: `fitted to data set titration-1 (sha256 ${row!.sha256})` })
    expect(reaction.value).toBeCloseTo(answer.body.fit.constants[0].value, 2)
    expect(reaction.uncertainty).toBeCloseTo(answer.body.fit.constants[0].standardError, 3)
    expect(await audit('dataset.apply')).toEqual([expect.objectContaining({ number: 2, dataset: id, sha256: row!.sha256 })])
  })

  it('lets an editor delete a data set, not a viewer', async () => {
    expect((await api(`${base()}/${id}`, { method: 'DELETE', cookie: viewer.cookie })).status).toBe(403)
    const answer = await api(`${base()}/${id}`, { method: 'DELETE', cookie: editor.cookie })
    expect(answer.status).toBe(200)
    expect(answer.body).toEqual({ deleted: id })
    expect((await api(`${base()}/${id}`, { cookie: viewer.cookie })).status).toBe(404)
    expect(await audit('dataset.delete')).toEqual([expect.objectContaining({ dataset: id, name: 'titration-1' })])
  })
})
