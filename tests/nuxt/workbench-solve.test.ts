// The stateless routes behind the workbench's preview: POST /api/solve and
// POST /api/check. Numbers are checked against closed forms of a weak acid.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()

// Acetic acid, pKa 4.76 at 25 °C (CRC Handbook of Chemistry and Physics lists 4.756; from memory).
const PKA = 4.76
const C = 0.1
const vinegar = (extra = '') => `system "Vinegar rinse"
activity ideal
component H+ balance
component CH3COO- total 100 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "water, 25 C (from memory)"
reaction CH3COOH <=> CH3COO- + H+ pKa ${PKA} cite "acetic acid, 25 C (from memory)"
${extra}`

let me: SignedIn
beforeAll(async () => {
  me = await signUp('solver')
})

describe('POST /api/solve', () => {
  it('solves a weak acid to the pH of the closed form', async () => {
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: vinegar() } })
    expect(answer.status).toBe(200)
    expect(answer.body.kind).toBe('single')
    expect(answer.body.solverVersion).toMatch(/^\d+\.\d+\.\d+/)
    // Weak monoprotic acid, water neglected: [H+]² + Ka[H+] − Ka·C = 0 (the textbook quadratic; common practice).
    // At pH ≈ 2.9 the OH⁻ term is 10⁻¹¹ mol/L, far below the tolerance.
    const ka = 10 ** -PKA
    const h = (-ka + Math.sqrt(ka * ka + 4 * ka * C)) / 2
    expect(answer.body.result.converged).toBe(true)
    expect(answer.body.result.pH).toBeCloseTo(-Math.log10(h), 4)
    const acetate = answer.body.result.species.find((s: { name: string }) => s.name === 'CH3COO-')
    expect(acetate.concentration).toBeCloseTo(h, 7)
  })

  it('solves a pH sweep: acetate is half the acid at pH = pKa (Henderson–Hasselbalch)', async () => {
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: vinegar('sweep pH from 3.76 to 5.76 step 1') } })
    expect(answer.status).toBe(200)
    expect(answer.body.kind).toBe('sweep')
    expect(answer.body.result.values).toHaveLength(3)
    const middle = answer.body.result.points[1]
    const conc = (name: string) => middle.species.find((s: { name: string }) => s.name === name).concentration
    expect(conc('CH3COO-') / (conc('CH3COO-') + conc('CH3COOH'))).toBeCloseTo(0.5, 6)
    // One pH unit above pKa the base is ten times the acid (same source).
    const last = answer.body.result.points[2]
    const lastConc = (name: string) => last.species.find((s: { name: string }) => s.name === name).concentration
    expect(lastConc('CH3COO-') / lastConc('CH3COOH')).toBeCloseTo(10, 4)
  })

  it('refuses a text with a compile error with 422 and the diagnostic on its line', async () => {
    const broken = vinegar().replace('CH3COOH <=> CH3COO- + H+', 'CH3COOH <=> CH3COO-')
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: broken } })
    expect(answer.status).toBe(422)
    expect(answer.body.message).toMatch(/before solving \(line 6: the reaction does not balance/)
    const errors = answer.body.data.diagnostics.filter((d: { severity: string }) => d.severity === 'error')
    expect(errors.length).toBeGreaterThan(0)
    expect(errors[0].range.line).toBe(6)
  })

  it('refuses a sweep over the points limit with 422 and says what to change', async () => {
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: vinegar('sweep pH from 2 to 12 points 6000') } })
    expect(answer.status).toBe(422)
    // One limit, shared/poise/limits.ts: the checker states it before the server has to.
    expect(answer.body.message).toBe('The system has 1 error; fix it before solving (line 7: points must be a whole number from 2 to 5000, not 6000)')
  })

  it('refuses an absurd sweep with 422 and the range, never a 200 full of nulls', async () => {
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: vinegar('sweep pH from -1e308 to 1e308 step 1') } })
    expect(answer.status).toBe(422)
    expect(answer.body.message).toContain("line 7: the sweep's first pH is -1e308, outside the range Poise accepts (from -2 to 16)")
    const errors = answer.body.data.diagnostics.filter((d: { code: string }) => d.code === 'P083')
    expect(errors).toHaveLength(2)
    expect(JSON.stringify(answer.body)).not.toMatch(/NaN|Infinity/)
  })

  it('refuses a number that reads as Infinity, and a total no solution can hold', async () => {
    const infinite = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: vinegar().replace('total 100 mmol/L', 'total 1e309 mol/L') } })
    expect(infinite.status).toBe(422)
    expect(infinite.body.message).toContain('1e309 is too large for Poise')
    const huge = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { source: vinegar().replace('total 100 mmol/L', 'total 1e6 mol/L') } })
    expect(huge.status).toBe(422)
    expect(huge.body.message).toContain('from 0 to 55 mol/L')
  })

  it('refuses an oversized text with 413, on both routes', async () => {
    const huge = vinegar(`# ${'x'.repeat(200_001)}\n`)
    for (const route of ['/api/solve', '/api/check']) {
      const answer = await api(route, { method: 'POST', cookie: me.cookie, body: { source: huge } })
      expect(answer.status).toBe(413)
      expect(answer.body.message).toMatch(/larger than 200,000 characters/)
    }
  })

  it('asks for the text when the body has none', async () => {
    const answer = await api('/api/solve', { method: 'POST', cookie: me.cookie, body: { text: 'system "x"' } })
    expect(answer.status).toBe(400)
    expect(JSON.stringify(answer.body)).toContain('Send the Poise text as \\"source\\"')
  })

  it('answers 401 to anonymous visitors', async () => {
    expect((await api('/api/solve', { method: 'POST', body: { source: vinegar() } })).status).toBe(401)
    expect((await api('/api/check', { method: 'POST', body: { source: vinegar() } })).status).toBe(401)
  })
})

describe('POST /api/check', () => {
  it('counts what a valid text declares', async () => {
    const answer = await api('/api/check', { method: 'POST', cookie: me.cookie, body: { source: vinegar('sweep pH from 3 to 7 step 0.5') } })
    expect(answer.status).toBe(200)
    expect(answer.body.ok).toBe(true)
    // H+, CH3COO-, OH-, CH3COOH; 3 to 7 by 0.5 is 9 points.
    expect(answer.body.summary).toEqual({ title: 'Vinegar rinse', components: 2, species: 4, solids: 0, sweepPoints: 9 })
  })

  it('reports a compile error without refusing the request', async () => {
    const answer = await api('/api/check', { method: 'POST', cookie: me.cookie, body: { source: vinegar().replace('pKa 4.76', 'pKa') } })
    expect(answer.status).toBe(200)
    expect(answer.body.ok).toBe(false)
    expect(answer.body.diagnostics.some((d: { severity: string, range: { line: number } }) => d.severity === 'error' && d.range.line === 6)).toBe(true)
  })
})
