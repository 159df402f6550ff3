import { describe, expect, it } from 'vitest'
import {
  diagramData,
  diagramRows,
  OKABE_ITO,
  styleForIndex,
  sweepAxisLabel,
} from '../../../shared/results/diagram'
import type { SweepResult } from '../../../shared/types/result'
import { carbonate, carbonateSweep, copperAmmonia, solvedAt, stoichiometry } from './fixtures'

const model = stoichiometry(carbonate)

describe('distribution diagram', () => {
  it('puts every bit of dissolved carbonate somewhere: fractions add to 1 at each converged point', () => {
    const sweep = carbonateSweep()
    const data = diagramData(sweep, model, { kind: 'distribution', component: 'CO3^2-', showAll: true })
    expect(data.series.map((s) => s.key)).toEqual(['CO3^2-', 'HCO3-', 'H2CO3'])
    sweep.points.forEach((point, k) => {
      if (!point.converged) return
      const sum = data.series.reduce((acc, s) => acc + s.values[k], 0)
      expect(Math.abs(sum - 1)).toBeLessThan(1e-9)
    })
  })

  it('crosses at the pKa: equal bicarbonate and carbonic acid at pH 6.35', () => {
    // At pH = pKa1 the two forms are equal (Henderson–Hasselbalch, closed form); pKa1 6.35 from memory.
    const sweep: SweepResult = {
      variable: 'pH',
      component: null,
      values: [6.35],
      points: [solvedAt(carbonate, [-6.35, -8])],
    }
    const data = diagramData(sweep, model, { kind: 'distribution', component: 'CO3^2-' })
    const share = (key: string) => data.series.find((s) => s.key === key)!.values[0]
    expect(share('HCO3-')).toBeCloseTo(share('H2CO3'), 3)
  })

  it('leaves a gap at a failed point instead of drawing a zero', () => {
    const sweep = carbonateSweep()
    const failed = sweep.values.indexOf(9)
    const data = diagramData(sweep, model, { kind: 'distribution', component: 'CO3^2-' })
    expect(data.failedPoints).toEqual([failed])
    for (const s of data.series) {
      expect(s.values[failed]).toBeNaN()
      expect(Number.isFinite(s.values[failed - 1])).toBe(true)
    }
    const rows = diagramRows(data).filter((r) => r.x === 9)
    expect(rows.length).toBe(data.series.length)
    expect(rows.every((r) => Number.isNaN(r.y))).toBe(true)
  })

  it('labels its axes in words with units', () => {
    const data = diagramData(carbonateSweep(), model, { kind: 'distribution', component: 'CO3^2-' })
    expect(data.xLabel).toBe('pH')
    expect(data.yLabel).toBe('Fraction of dissolved CO₃²⁻')
    expect(data.yDomain).toEqual([0, 1])
  })

  it('gives no series for a component the model does not have', () => {
    const data = diagramData(carbonateSweep(), model, { kind: 'distribution', component: 'Zn^2+' })
    expect(data.series).toEqual([])
  })
})

describe('log-concentration diagram', () => {
  it('hides species that stay below the floor, and shows them on request', () => {
    const sweep = carbonateSweep()
    // H+ never passes 1e-4 mol/L (pH 4 is the lowest point); OH- reaches 1e-2 at pH 12, H2CO3 nearly 2e-3.
    const hidden = diagramData(sweep, model, { kind: 'logConcentration', component: null, floor: 1e-3 })
    expect(hidden.hidden).toEqual(['H+'])
    expect(hidden.series.map((s) => s.key)).not.toContain('H+')
    const all = diagramData(sweep, model, { kind: 'logConcentration', component: null, floor: 1e-3, showAll: true })
    expect(all.series.map((s) => s.key)).toEqual(['H+', 'OH-', 'CO3^2-', 'HCO3-', 'H2CO3'])
    expect(all.hidden).toEqual([])
  })

  it('plots log10 of the concentration', () => {
    const sweep = carbonateSweep()
    const data = diagramData(sweep, model, { kind: 'logConcentration', component: null })
    const h = data.series.find((s) => s.key === 'H+')!
    expect(h.values[0]).toBeCloseTo(-4, 12)
    expect(data.yLabel).toBe('log₁₀ of concentration in mol/L')
  })
})

describe('solubility diagram', () => {
  it('plots the dissolved total, log10, with gaps at failed points', () => {
    const sweep = carbonateSweep()
    const data = diagramData(sweep, model, { kind: 'solubility', component: 'CO3^2-' })
    const dissolved = data.series.find((s) => s.key === 'dissolved')!
    const failed = sweep.values.indexOf(9)
    expect(dissolved.values[0]).toBeCloseTo(Math.log10(2e-3), 10)
    expect(dissolved.values[failed]).toBeNaN()
    expect(dissolved.label).toBe('dissolved CO₃')
  })

  it('shows a constant total over two whole decades rather than stretching rounding noise', () => {
    const data = diagramData(carbonateSweep(), model, { kind: 'solubility', component: 'CO3^2-' })
    // log10(2e-3) = -2.70
    expect(data.yDomain).toEqual([-4, -1])
  })

  it('lets a log axis fit curves that span many decades', () => {
    expect(diagramData(carbonateSweep(), model, { kind: 'logConcentration', component: null }).yDomain).toBeNull()
  })
})

describe('colours and axes', () => {
  it('uses the Okabe–Ito palette in its published order, by species index in the model', () => {
    expect(OKABE_ITO.slice(0, 3)).toEqual(['#000000', '#BF8400', '#4897C4'])
    const data = diagramData(carbonateSweep(), model, { kind: 'logConcentration', component: null, showAll: true })
    expect(data.series.map((s) => s.color)).toEqual(OKABE_ITO.slice(0, 5))
  })

  it('draws every line at 3:1 contrast or more on the white plot', () => {
    // WCAG 2.1: relative luminance of sRGB and contrast ratio (L1 + 0.05) / (L2 + 0.05); 3:1 for graphics.
    const channel = (c: number) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4)
    const luminance = (hex: string) => {
      const [r, g, b] = [1, 3, 5].map((i) => channel(parseInt(hex.slice(i, i + 2), 16) / 255))
      return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!
    }
    for (const colour of OKABE_ITO) expect((1 + 0.05) / (luminance(colour) + 0.05), colour).toBeGreaterThanOrEqual(3)
  })

  it('keeps a species colour when other species are hidden', () => {
    const all = diagramData(carbonateSweep(), model, { kind: 'logConcentration', component: null, showAll: true })
    const some = diagramData(carbonateSweep(), model, { kind: 'distribution', component: 'CO3^2-' })
    for (const s of some.series) expect(s.color).toBe(all.series.find((a) => a.key === s.key)!.color)
  })

  it('changes the dash after eight colours so the ninth species differs from the first', () => {
    expect(styleForIndex(8).color).toBe(styleForIndex(0).color)
    expect(styleForIndex(8).dash).not.toBe(styleForIndex(0).dash)
  })

  it('names the swept variable with its unit, and uses a log axis for a sweep over decades', () => {
    expect(sweepAxisLabel({ variable: 'total', component: 'NH3' })).toBe('Total NH₃ (mol/L)')
    expect(sweepAxisLabel({ variable: 'temperature', component: null })).toBe('Temperature (°C)')
    expect(sweepAxisLabel({ variable: 'pressure', component: 'CO2(g)' })).toBe('Partial pressure of CO₂(g) (atm)')
    const values = [1e-4, 1e-3, 1e-2, 1e-1]
    const sweep: SweepResult = {
      variable: 'total',
      component: 'NH3',
      values,
      points: values.map((t) => solvedAt(copperAmmonia, [-9, -9, Math.log10(t)])),
    }
    expect(diagramData(sweep, stoichiometry(copperAmmonia), { kind: 'distribution', component: 'NH3' }).xLog).toBe(true)
  })
})

describe('the chosen floor', () => {
  it('hides more distribution curves as the share chosen rises', () => {
    const at = (shareFloor: number) => diagramData(carbonateSweep(), model, { kind: 'distribution', component: 'CO3^2-', shareFloor })
    const low = at(1e-3)
    const high = at(0.99)
    expect(high.series.length).toBeLessThan(low.series.length)
    // Only carbonic acid passes 99 % (at pH 4, two units below its pKa); bicarbonate and carbonate peak near 98 %.
    expect(high.series.map((s) => s.key)).toEqual(['H2CO3'])
    // Each curve left reaches the floor somewhere; each hidden one never does.
    for (const s of high.series) expect(Math.max(...s.values.filter(Number.isFinite))).toBeGreaterThanOrEqual(0.99)
    for (const key of high.hidden) expect(Math.max(...low.series.find((s) => s.key === key)!.values.filter(Number.isFinite))).toBeLessThan(0.99)
  })
})
