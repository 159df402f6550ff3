// Both revisions' sweep curves for the compare page's one diagram.
import { describe, expect, it } from 'vitest'
import { solve, sweep } from '../../../server/solver/index'
import { compareCurves, mostMoved, thinned } from '../../../shared/diff/curves'
import { compiled, copperAmmine } from './fixtures'

// Demo systems (invented constants): copper along its total, before and after a change of log beta.
const along = (logBeta: number) => copperAmmine(logBeta) + 'sweep total Cu^2+ from 0.5 mmol/L to 2 mmol/L points 7\n'

describe('compareCurves', () => {
  it('gives pH and every species along each side\'s sweep values, and opens on the curve that moved most', () => {
    const before = sweep(compiled(along(4.0)))
    const after = sweep(compiled(along(4.5)))
    const curves = compareCurves(before, after)!
    expect(curves.from.values).toEqual(before.values)
    expect(curves.to.values).toEqual(after.values)
    expect(curves.curves.map((c) => c.name)).toEqual(['pH', ...before.points[0]!.species.map((s) => s.name)])
    const copper = curves.curves.find((c) => c.name === 'Cu^2+')!
    expect(copper.quantity).toBe('log10 c')
    expect(copper.from).toEqual(before.points.map((p) => p.species.find((s) => s.name === 'Cu^2+')!.log10))
    // A stronger complex takes more copper from the free ion: log10 [Cu²⁺] falls at every point.
    copper.to.forEach((y, i) => expect(y!).toBeLessThan(copper.from[i]!))
    expect(mostMoved(curves)?.name).not.toBe('pH')
  })

  it('has no shared axis for a single solve or sweeps over different variables', () => {
    const one = solve(compiled(copperAmmine(4.0)))
    const swept = sweep(compiled(along(4.0)))
    expect(compareCurves(one, swept)).toBeNull()
    const overTemperature = sweep(compiled(copperAmmine(4.0) + 'sweep temperature from 15 C to 35 C points 3\n'))
    expect(compareCurves(swept, overTemperature)).toBeNull()
  })

  it('thins a long sweep to at most the points asked, keeping both ends', () => {
    expect(thinned(5, 10)).toEqual([0, 1, 2, 3, 4])
    const kept = thinned(10_001, 201)
    expect(kept).toHaveLength(201)
    expect(kept[0]).toBe(0)
    expect(kept.at(-1)).toBe(10_000)
  })
})
