import { describe, expect, it } from 'vitest'
import { diffResults, incomparableReason } from '../../../shared/diff/results-diff'
import type { Result, SweepResult } from '../../../shared/types/result'
import { solve, sweep } from '../../../server/solver/index'
import { compiled, copperAmmine } from './fixtures'

function solved(source: string): Result {
  const result = solve(compiled(source))
  expect(result.converged).toBe(true)
  return result
}

describe('results diff of a raised formation constant', () => {
  // Closed form of a 1:1 complex ML at a fixed free ligand L (mass action and
  // mass balance, common practice): [M] = M_T / (1 + β[L]), [ML] = β[L][M].
  const total = 1e-3
  const ligand = 1e-3
  const free = (beta: number) => total / (1 + beta * ligand)
  const complex = (beta: number) => beta * ligand * free(beta)
  const diff = diffResults(solved(copperAmmine(4)), solved(copperAmmine(5)))
  const change = (name: string) => diff.species.find(s => s.name === name)

  it('says the complex went up and the free metal went down, by the closed-form factors', () => {
    expect(change('CuNH3^2+')!.factor).toBeCloseTo(complex(1e5) / complex(1e4), 6)
    expect(change('CuNH3^2+')!.factor).toBeGreaterThan(1)
    expect(change('Cu^2+')!.factor).toBeCloseTo(free(1e5) / free(1e4), 6)
    expect(change('Cu^2+')!.factor).toBeLessThan(1)
    expect(change('Cu^2+')!.to).toBeCloseTo(free(1e5), 12)
  })

  it('lists the free metal, which moved most, first and leaves out what did not move', () => {
    expect(diff.species[0]!.name).toBe('Cu^2+')
    // Free NH3 is held fixed: it does not move, so it is not listed.
    expect(change('NH3')).toBeUndefined()
  })

  it('leaves the ionic strength unchanged when copper moves between two ions of the same charge', () => {
    // Both carry 2+: I = ½ Σ c z² is unchanged by moving Cu between them (definition of ionic strength).
    expect(diff.ionicStrength!.change).toBeCloseTo(1, 9)
    expect(diff.solids).toEqual([])
  })

  it('reports no pH for a system without H+ (the number the solver reports there means nothing)', () => {
    expect(diff.pH).toBeNull()
  })
})

describe('results diff of sweeps', () => {
  const withSolid = (suppressed: boolean) => `system "Copper hydroxide across pH"
temperature 25 C
activity ideal
component H+     pH 5
component Cu^2+  total 1.0 mmol/L
reaction H2O <=> H+ + OH-              pKw 14.00   cite "demo value"
reaction Cu(OH)2(s) <=> Cu^2+ + 2 OH-  pKsp 19.66  cite "demo value"
${suppressed ? 'solid Cu(OH)2(s) suppressed' : ''}
sweep pH from 4 to 9 step 1`

  it('says where a solid appears: at the points where the old answer was supersaturated', () => {
    const before = sweep(compiled(withSolid(true)))
    const after = sweep(compiled(withSolid(false)))
    expect(incomparableReason(before, after)).toBeNull()
    const diff = diffResults(before, after)
    // A solid can only form where its saturation index is above zero (definition of the saturation index, common practice).
    const supersaturated = before.values.filter((_, i) => before.points[i]!.solids.find(s => s.name === 'Cu(OH)2(s)')!.saturationIndex! > 0)
    expect(supersaturated.length).toBeGreaterThan(0)
    expect(diff.kind).toBe('sweep')
    expect(diff.solids).toEqual([{ name: 'Cu(OH)2(s)', change: 'appears', at: supersaturated, ranges: [[supersaturated[0], supersaturated.at(-1)]] }])
    expect(diff.species.find(s => s.name === 'Cu^2+')!.factor).toBeLessThan(1)
    // Dissolved Cu drops where the hydroxide takes it: the largest drop is at the last point, where the least stays dissolved.
    const dissolvedCu = diff.dissolved.find(d => d.name === 'Cu^2+')!
    expect(dissolvedCu.factor!).toBeLessThan(1e-2)
    const last = after.points.at(-1)!.components.find(c => c.name === 'Cu^2+')!
    expect(dissolvedCu.to).toBe(last.dissolved)
    expect(dissolvedCu.at).toBe(9)
    // A pH sweep holds H+ at each value: the pH is the variable, not a result to compare.
    expect(diff.pH).toBeNull()
  })

  it('reports a saturation index raised by log10 2 at every point when a total is doubled and the solid cannot form', () => {
    const doubled = withSolid(true).replace('total 1.0 mmol/L', 'total 2.0 mmol/L')
    const diff = diffResults(sweep(compiled(withSolid(true))), sweep(compiled(doubled)))
    // SI = log K + log a(Cu2+) + 2 log a(OH-); ideal activities, no complexes, pH held: a(Cu2+) doubles (definition of the saturation index, common practice).
    expect(diff.saturation).toEqual([expect.objectContaining({ name: 'Cu(OH)2(s)', change: expect.closeTo(Math.log10(2), 9) })])
    expect(diff.solids).toEqual([])
  })

  function point(pH: number, copper: number): Result {
    return {
      converged: true, iterations: 1, temperatureC: 25, pH, ionicStrength: 3 * copper,
      species: [{ name: 'Cu^2+', charge: 2, concentration: copper, log10: Math.log10(copper), activity: copper, gamma: 1 }],
      solids: [], components: [], residuals: { maxScaled: 0 },
    }
  }
  const along = (copper: number[]): SweepResult => ({ variable: 'pH', component: null, values: [4, 5, 6], points: copper.map((c, i) => point(4 + i, c)) })

  it('reports the largest change along the sweep and the sweep value where it happens', () => {
    const diff = diffResults(along([1e-3, 1e-3, 1e-3]), along([1e-3, 1e-5, 1e-4]))
    expect(diff.species).toEqual([{ name: 'Cu^2+', from: 1e-3, to: 1e-5, factor: expect.closeTo(1e-2, 12), size: expect.closeTo(2, 9), at: 5 }])
  })

  it('refuses to pair points of sweeps over different values', () => {
    const other: SweepResult = { ...along([1, 1, 1]), values: [4, 6, 8] }
    expect(incomparableReason(along([1, 1, 1]), other)).toMatch(/different points/)
    expect(incomparableReason(along([1, 1, 1]), point(7, 1))).toMatch(/sweep and the other a single solve/)
  })
})
