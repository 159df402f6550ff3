// Importing .poise files: a valid file becomes a system or a revision; a
// file that is not UTF-8 text, or too large, is refused with a clear message.
import { beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

let editor: SignedIn
let viewer: SignedIn
let lab: string

async function upload(path: string, who: SignedIn, file: { name: string, bytes: Uint8Array<ArrayBuffer> | string }, fields: Record<string, string> = {}) {
  const form = new FormData()
  form.append('file', new Blob([file.bytes]), file.name)
  for (const [key, value] of Object.entries(fields)) form.append(key, value)
  const response = await fetch(url(path), { method: 'POST', headers: { cookie: who.cookie, accept: 'application/json' }, body: form })
  return { status: response.status, body: await response.json() }
}

const rinse = 'system "Copper rinse, tank 2"\ncomponent H+ balance\ncomponent Cu^2+ total 0.1 mM\n'

beforeAll(async () => {
  const owner = await signUp('owner')
  ;[editor, viewer] = await Promise.all([signUp('editor'), signUp('viewer')])
  lab = await makeLab(owner, [{ who: editor, role: 'editor' }, { who: viewer, role: 'viewer' }])
})

describe('importing .poise files', () => {
  it('makes a new system named by its `system` line, with the text as revision 1', async () => {
    const answer = await upload(`/api/labs/${lab}/imports`, editor, { name: 'rinse.poise', bytes: '\uFEFF' + rinse.replace(/\n/g, '\r\n') })
    expect(answer.status).toBe(201)
    expect(answer.body.system).toMatchObject({ slug: 'copper-rinse-tank-2', title: 'Copper rinse, tank 2' })
    expect(answer.body.system.latest).toMatchObject({ number: 1, source: rinse, message: 'Imported from rinse.poise' })
    const again = await upload(`/api/labs/${lab}/imports`, editor, { name: 'rinse.poise', bytes: rinse })
    expect(again.status).toBe(409)
    expect(again.body.message).toMatch(/already has a system at "copper-rinse-tank-2"/)
  })

  it('adds the next revision of a system, and refuses one based on a stale revision', async () => {
    await upload(`/api/labs/${lab}/imports`, editor, { name: 'x.poise', bytes: rinse }, { slug: 'tank-three', title: 'Tank 3' })
    const changed = rinse.replace('0.1 mM', '0.2 mM')
    const next = await upload(`/api/labs/${lab}/systems/tank-three/imports`, editor, { name: 'tank3.poise', bytes: changed }, { message: 'Measured again', baseRevision: '1' })
    expect(next.status).toBe(201)
    expect(next.body.system.latest).toMatchObject({ number: 2, source: changed, message: 'Measured again' })
    const stale = await upload(`/api/labs/${lab}/systems/tank-three/imports`, editor, { name: 'tank3.poise', bytes: rinse }, { baseRevision: '1' })
    expect(stale.status).toBe(409)
    expect(stale.body.data.latestRevision).toBe(2)
  })

  it('refuses a file that is not UTF-8 text, saying to save it as UTF-8', async () => {
    // "Ca²⁺" in Latin-1: 0xB2 alone is not valid UTF-8.
    const latin1 = Uint8Array.from([...Buffer.from('system "Ca', 'ascii'), 0xb2, ...Buffer.from('"\n', 'ascii')])
    const answer = await upload(`/api/labs/${lab}/imports`, editor, { name: 'old.poise', bytes: latin1 })
    expect(answer.status).toBe(415)
    expect(answer.body.message).toMatch(/"old\.poise" is not UTF-8 text\. Save it as UTF-8/)
    const binary = await upload(`/api/labs/${lab}/imports`, editor, { name: 'image.poise', bytes: Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0, 0, 0, 0]) })
    expect(binary.status).toBe(415)
    expect(binary.body.message).toMatch(/binary file/)
    const wrongName = await upload(`/api/labs/${lab}/imports`, editor, { name: 'data.csv', bytes: rinse })
    expect(wrongName.status).toBe(415)
  })

  it('answers 413 for a file over the limit', async () => {
    const huge = rinse + '# padding\n'.repeat(30_000)
    const answer = await upload(`/api/labs/${lab}/imports`, editor, { name: 'huge.poise', bytes: huge })
    expect(answer.status).toBe(413)
    expect(answer.body.message).toMatch(/larger than 256 KiB/)
  })

  it('needs the editor role, a file field, and multipart', async () => {
    expect((await upload(`/api/labs/${lab}/imports`, viewer, { name: 'v.poise', bytes: rinse })).status).toBe(403)
    const form = new FormData()
    form.append('title', 'No file')
    const noFile = await fetch(url(`/api/labs/${lab}/imports`), { method: 'POST', headers: { cookie: editor.cookie }, body: form })
    expect(noFile.status).toBe(400)
    const json = await api(`/api/labs/${lab}/imports`, { method: 'POST', cookie: editor.cookie, body: { source: rinse } })
    expect(json.status).toBe(415)
    const garbled = await fetch(url(`/api/labs/${lab}/imports`), { method: 'POST', headers: { cookie: editor.cookie, 'content-type': 'multipart/form-data; boundary=zz' }, body: 'not a form at all' })
    expect(garbled.status).toBe(400)
    expect((await garbled.json()).message).toMatch(/Choose a \.poise file|could not be read as a form/)
  })
})
