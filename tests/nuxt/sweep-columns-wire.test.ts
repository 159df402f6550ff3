// A sweep answered by columns over HTTP: a client that says it reads the
// binary form (Accept) gets the columns, which decode to the same points as
// the JSON answer other clients keep getting; single solves, titrations and
// refusals stay JSON.
import { beforeAll, describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { siteOrigin, signUp, type SignedIn } from '../setup/accounts'
import { BINARY_ANSWER_TYPE, decodeBinaryAnswer } from '../../shared/results/binary-answer'
import { fromSweepColumns, type SweepColumns } from '../../shared/results/sweep-columns'

await useBuiltServer()

const sweepSource = `system "Vinegar rinse"
activity davies
component H+ balance
component CH3COO- total 100 mmol/L
component Na+ total 20 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 cite "acetic acid, 25 C (from memory)"
sweep pH from 3 to 7 points 150
`

let me: SignedIn
beforeAll(async () => { me = await signUp('columns') })

function solve(source: string, accept: string) {
  return fetch(url('/api/solve'), {
    method: 'POST',
    headers: { 'content-type': 'application/json', accept, 'accept-encoding': 'br, gzip', origin: siteOrigin(), cookie: me.cookie },
    body: JSON.stringify({ source }),
  })
}

describe('a sweep answered by columns', () => {
  it('decodes to the same answer as the JSON form, point for point', async () => {
    const json = await solve(sweepSource, 'application/json')
    expect(json.headers.get('content-type')).toMatch(/^application\/json/)
    const points = await json.json()
    const binary = await solve(sweepSource, `${BINARY_ANSWER_TYPE}, application/json`)
    expect(binary.status).toBe(200)
    expect(binary.headers.get('content-type')).toBe(BINARY_ANSWER_TYPE)
    expect(binary.headers.get('vary')).toMatch(/accept/i)
    const decoded = decodeBinaryAnswer<{ kind: string, solverVersion: string, model: { components: unknown[] }, result: SweepColumns }>(await binary.arrayBuffer())
    expect(decoded.kind).toBe('sweep')
    expect(decoded.solverVersion).toBe(points.solverVersion)
    expect(decoded.model).toEqual(points.model)
    expect(decoded.result.format).toBe('sweep-columns')
    expect(decoded.result.templateOf).toHaveLength(150)
    expect(JSON.stringify(fromSweepColumns(decoded.result))).toBe(JSON.stringify(points.result))
  })

  it('keeps JSON for a single solve and for a refusal, whatever the client accepts', async () => {
    const single = await solve(sweepSource.replace(/^sweep .*\n/m, ''), `${BINARY_ANSWER_TYPE}, application/json`)
    expect(single.status).toBe(200)
    expect(single.headers.get('content-type')).toMatch(/^application\/json/)
    expect((await single.json()).kind).toBe('single')
    const refused = await solve(sweepSource.replace('points 150', 'points 6000'), `${BINARY_ANSWER_TYPE}, application/json`)
    expect(refused.status).toBe(422)
    expect(refused.headers.get('content-type')).toMatch(/^application\/json/)
    expect((await refused.json()).message).toMatch(/points/)
  })
})
