// A map through the API: a preview answers its cells by columns (MapAnswer),
// a stored run of a map is listed and read back whole, and a map over the
// cell limit is refused with a message saying what to change.
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'
import { mapCell } from '../../shared/results/map-columns'
import type { MapAnswer } from '../../shared/types/result'
import { SIZE_LIMITS } from '../../shared/poise/limits'

await useBuiltServer()

let editor: SignedIn
let lab: string

// Water and a strong acid's anion over pH and temperature: the pH of each cell is the one it holds.
const source = (map: string) => `system "Rinse over pH and temperature"
activity ideal
component H+ balance
component Cl- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 dH 55.84 kJ/mol cite "water (from memory)"
${map}
`
const small = source('map pH from 4 to 10 points 4 by temperature from 15 C to 35 C points 3')

beforeAll(async () => {
  editor = await signUp('editor')
  lab = await makeLab(editor, [])
  const created = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Rinse map', slug: 'rinse-map', source: small } })
  expect(created.status).toBe(201)
})

describe('maps through the API', () => {
  it('answers a preview of a map with its cells by columns, each cell the Result at its two values', async () => {
    const preview = await api(`/api/labs/${lab}/solve`, { method: 'POST', cookie: editor.cookie, body: { source: small } })
    expect(preview.status).toBe(200)
    expect(preview.body.kind).toBe('map')
    const map = preview.body.result as MapAnswer
    expect(map).toMatchObject({ format: 'map-columns', cellsDone: 12, failedCells: 0, cancelled: false })
    expect(map.x).toEqual({ variable: 'pH', component: null, values: [4, 6, 8, 10], log: false })
    expect(map.y.values).toEqual([15, 25, 35])
    const cell = mapCell(map, 2, 1)
    expect(cell.converged).toBe(true)
    expect(cell.pH).toBeCloseTo(6, 9)
    expect(cell.temperatureC).toBe(35)
  })

  it('stores a run of a map, lists it as a map and reads it back whole', async () => {
    const made = await api(`/api/labs/${lab}/systems/rinse-map/runs`, { method: 'POST', cookie: editor.cookie, body: {} })
    expect([200, 201, 202]).toContain(made.status)
    const list = await api(`/api/labs/${lab}/systems/rinse-map/runs`, { cookie: editor.cookie })
    const run = list.body.runs[0]
    expect(run.kind).toBe('map')
    let read = await api(`/api/labs/${lab}/systems/rinse-map/runs/${run.id}`, { cookie: editor.cookie })
    for (let i = 0; i < 100 && !read.body.result; i++) {
      await new Promise((r) => setTimeout(r, 100))
      read = await api(`/api/labs/${lab}/systems/rinse-map/runs/${run.id}`, { cookie: editor.cookie })
    }
    expect(read.status).toBe(200)
    expect(read.body.kind).toBe('map')
    expect(read.body.model.map.x.values).toEqual([4, 6, 8, 10])
    expect(mapCell(read.body.result as MapAnswer, 0, 3).pH).toBeCloseTo(10, 9)
  })

  it('refuses a map over the cell limit, saying how many cells and what to change', async () => {
    const side = Math.ceil(Math.sqrt(SIZE_LIMITS.maxMapCells)) + 1
    const big = source(`map pH from 4 to 10 points ${side} by temperature from 15 C to 35 C points ${side}`)
    const refused = await api(`/api/labs/${lab}/solve`, { method: 'POST', cookie: editor.cookie, body: { source: big } })
    expect(refused.status).toBe(422)
    expect(JSON.stringify(refused.body)).toContain(`this map has ${side} × ${side} = ${side * side} cells; it may have at most ${SIZE_LIMITS.maxMapCells}: use fewer points on an axis`)
  })
})
