/** The home page's recent systems: my labs' systems, newest save first, and nobody else's. */
import { expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp } from '../setup/accounts'

await useBuiltServer()

it('lists the systems of my labs, newest save first, with lab and revision', async () => {
  const me = await signUp('recent')
  const lab = await makeLab(me)
  for (const slug of ['older', 'newer']) {
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: me.cookie, body: { title: `System ${slug}`, slug } })).status).toBe(201)
  }
  const saved = await api(`/api/labs/${lab}/systems/older`, { method: 'PATCH', cookie: me.cookie, body: { source: 'system "older"\n', message: 'second', baseRevision: 1 } })
  expect(saved.status).toBe(200)
  const answer = await api('/api/me/recent-systems', { cookie: me.cookie })
  expect(answer.status).toBe(200)
  expect(answer.body.systems.map((s: { slug: string }) => s.slug)).toEqual(['older', 'newer'])
  expect(answer.body.systems[0]).toMatchObject({ title: 'System older', lab: { slug: lab }, latestRevision: 2 })
})

it('shows nothing from labs I am not in, and 401 signed out', async () => {
  const outsider = await signUp('outsider')
  const other = await signUp('other')
  const lab = await makeLab(other)
  await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: other.cookie, body: { title: 'Private', slug: 'private' } })
  const answer = await api('/api/me/recent-systems', { cookie: outsider.cookie })
  expect(answer.status).toBe(200)
  expect(answer.body.systems).toEqual([])
  expect((await api('/api/me/recent-systems')).status).toBe(401)
})
