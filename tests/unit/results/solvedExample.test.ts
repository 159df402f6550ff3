// The results modules on a real compile + solve of a shipped example (zinc
// removal by sulfide dosing), rather than on hand-built fixtures: species
// names, stoichiometry and solids come from the compiler and the solver.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { sweep as runSweep } from '../../../server/solver/index'
import { diagramData } from '../../../shared/results/diagram'
import { dissolvedTotal } from '../../../shared/results/share'
import { sweepToxicCautions } from '../../../shared/results/cautions'
import { sweepCsv } from '../../../shared/results/export'
import { parseCsv } from './csvParse'

const { model } = compile(readFileSync(new URL('../../../examples/zinc-sulfide-dosing.poise', import.meta.url), 'utf8'))
if (!model) throw new Error('the zinc sulfide example no longer compiles')
const sweep = runSweep(model)
const converged = sweep.points.filter((p) => p.converged)

describe('results of the zinc sulfide dosing example', () => {
  it('converges at most points of its pH sweep', () => {
    expect(converged.length).toBeGreaterThan(sweep.points.length / 2)
  })

  it('shares out all dissolved sulfide and zinc: fractions add to 1 within 1e-9 at every point', () => {
    for (const component of ['HS-', 'Zn^2+']) {
      const data = diagramData(sweep, model, { kind: 'distribution', component, showAll: true })
      sweep.points.forEach((point, k) => {
        if (!point.converged) return
        const sum = data.series.reduce((acc, s) => acc + s.values[k], 0)
        expect(Math.abs(sum - 1)).toBeLessThan(1e-9)
      })
    }
  })

  it('closes the sulfide mass balance: dissolved plus ZnS equals the 1.0 mmol/L dosed', () => {
    // Mass balance of a total component (the definition of a total, common practice): Σ ν c (aqueous) + Σ ν n (solids) = T.
    const zns = model.solids.findIndex((s) => s.name === 'ZnS(s)')
    const hs = model.components.findIndex((c) => c.name === 'HS-')
    for (const point of converged) {
      const solid = point.solids.find((s) => s.name === 'ZnS(s)')!
      const total = dissolvedTotal(point, model, 'HS-') + model.solids[zns].nu[hs] * solid.amount
      expect(Math.abs(total - 1.0e-3) / 1.0e-3).toBeLessThan(1e-9)
      expect(dissolvedTotal(point, model, 'HS-')).toBeCloseTo(point.components[hs].dissolved!, 15)
    }
  })

  it('warns about hydrogen sulfide at the acid end of the sweep', () => {
    const [caution] = sweepToxicCautions(sweep, model)
    expect(caution.species).toBe('H2S')
    expect(caution.at).toBe(sweep.values[0])
  })

  it('exports one CSV row a point, with the amount of ZnS that precipitated', () => {
    const rows = parseCsv(sweepCsv(sweep))
    expect(rows).toHaveLength(sweep.values.length + 1)
    const column = rows[0].indexOf('ZnS(s) amount (mol/L)')
    expect(column).toBeGreaterThan(0)
    sweep.points.forEach((p, k) => {
      if (p.converged) expect(Number(rows[k + 1][column])).toBe(p.solids.find((s) => s.name === 'ZnS(s)')!.amount)
    })
  })
})
