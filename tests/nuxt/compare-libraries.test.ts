// Comparing two revisions of a system that `use`s a lab library: both compile
// with the lab's libraries, so the model and results diffs are there.
import { expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp } from '../setup/accounts'

await useBuiltServer()

// Acetic acid, pKa 4.76 at 25 °C (handbook value, from memory).
const libraryText = `system "Acid constants"
component H+ balance
component CH3COO- total 10 mM
reaction H2O <=> H+ + OH- pKw 14 cite "water (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 cite "acetic acid (from memory)"
`
const consumerText = (total: string) => `system "Vinegar rinse"
use "acids"
component H+ balance
component CH3COO- total ${total}
`

it('compares two revisions of a system that uses a library, with the library resolved in its lab', async () => {
  const owner = await signUp('comparer')
  const lab = await makeLab(owner)
  for (const [slug, source] of [['acids', libraryText], ['vinegar', consumerText('10 mM')]] as const) {
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: slug, slug, source } })).status).toBe(201)
  }
  expect((await api(`/api/labs/${lab}/systems/acids/library`, { method: 'PUT', cookie: owner.cookie, body: { isLibrary: true } })).status).toBe(200)
  expect((await api(`/api/labs/${lab}/systems/vinegar`, { method: 'PATCH', cookie: owner.cookie, body: { source: consumerText('1 mM'), baseRevision: 1 } })).status).toBe(200)

  const compared = await api(`/api/labs/${lab}/systems/vinegar/compare?from=1&to=2`, { cookie: owner.cookie })
  expect(compared.status).toBe(200)
  expect(compared.body.problems).toEqual([])
  expect(compared.body.modelDiff).not.toBeNull()
  expect(compared.body.resultsDiff).not.toBeNull()
  // The diff names the total that changed (from the file itself, the library's reactions on both sides).
  expect(JSON.stringify(compared.body.modelDiff)).toContain('CH3COO')
})
