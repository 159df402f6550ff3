// POST /api/solve with a titration: the curve and the dose in the JSON
// contract, and a titration error refused with its diagnostic. Numbers
// against the closed forms of a strong acid with a strong base.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

// Kw = 1.0e-14 at 25 °C (from memory); H+ + OH- -> H2O, so the end point is at V0·C0/Ct.
const acid = (study: string, titrant = 'titrant Na+ 0.1000 mol/L\ntitrant OH- 0.1000 mol/L') => `system "Hydrochloric acid with caustic"
activity ideal
component H+ balance
component Cl- total 0.1000 mol/L
component Na+ total 0 mol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
sample volume 25.00 mL
${titrant}
${study}
`

let me: SignedIn
beforeAll(async () => {
  me = await signUp('titrator')
})

describe('POST /api/solve with a titration', () => {
  it('returns the curve: kind titration, volumes in mL, β on every point, the end point at 25.00 mL and pH 7', async () => {
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: acid('titrate from 0 to 40 mL step 1') } })
    expect(answer.status).toBe(200)
    expect(answer.body.kind).toBe('titration')
    const t = answer.body.result
    expect(t.kind).toBe('titration')
    expect(t.sampleVolumeL).toBeCloseTo(0.025, 12)
    expect(t.values).toHaveLength(41)
    expect(t.points.every((p: { converged: boolean; bufferCapacity: number }) => p.converged && p.bufferCapacity > 0)).toBe(true)
    expect(t.equivalencePoints).toHaveLength(1)
    expect(t.equivalencePoints[0].volume).toBeCloseTo(25, 3)
    expect(t.equivalencePoints[0].pH).toBeCloseTo(7, 2)
  })

  it('returns the dose to a target pH, and says when the titrant cannot reach it', async () => {
    const dose = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: acid('titrate to pH 7') } })
    expect(dose.status).toBe(200)
    expect(dose.body.result).toMatchObject({ kind: 'titration', target: { pH: 7 } })
    expect(dose.body.result.volume).toBeCloseTo(25, 6)
    expect(dose.body.result.point.pH).toBeCloseTo(7, 6)
    const never = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: acid('titrate to pH 0.5') } })
    expect(never.status).toBe(200)
    expect(never.body.result.volume).toBeNull()
    expect(never.body.result.reason).toMatch(/^pH 0.5 is not reachable with this titrant/)
  })

  it('refuses an unbalanced titrant with 422 and says by how much', async () => {
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: acid('titrate to pH 7', 'titrant Na+ 0.1000 mol/L\ntitrant OH- 0.0900 mol/L') } })
    expect(answer.status).toBe(422)
    const errors = answer.body.data.diagnostics.filter((d: { severity: string }) => d.severity === 'error')
    expect(errors.map((d: { code: string }) => d.code)).toEqual(['P093'])
    expect(errors[0].message).toMatch(/charges sum to \+0\.01 mol\/L/)
  })
})
