import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { sweep } from '../../../server/solver/index'
import { compile } from '../../../shared/poise/index'
import { diagramData, limitOverlay } from '../../../shared/results/diagram'
import { limitSentence, sweptValueText } from '../../../shared/results/limits'
import { unitScale } from '../../../shared/results/units'

// The shipped nickel rinse (constants from memory): what the diagram draws for its 1 mg/L limit.
const model = compile(readFileSync(join(__dirname, '../../../examples/nickel-rinse-discharge.poise'), 'utf8')).model!
const answer = sweep(model)

describe('limit overlay of a diagram', () => {
  it('shades the window on every kind and draws the limit on the solubility diagram of nickel, in the shown unit', () => {
    const [[from, to]] = answer.limits![0]!.ranges
    for (const kind of ['distribution', 'logConcentration', 'solubility'] as const) {
      const data = diagramData(answer, model, { kind, component: 'Ni^2+' })
      const overlay = limitOverlay(data, answer.limits, model.limits, model, 'Ni^2+')
      expect(overlay.bands).toEqual([{ from, to, label: 'dissolved Ni ≤ 1 mg/L' }])
      expect(overlay.lines.length).toBe(kind === 'solubility' ? 1 : 0)
    }
    const molar = limitOverlay(diagramData(answer, model, { kind: 'solubility', component: 'Ni^2+' }), answer.limits, model.limits, model, 'Ni^2+')
    // 1 mg/L of Ni is 1e-3 / 58.693 mol/L (IUPAC, Standard atomic weights 2021).
    expect(molar.lines[0]!.y).toBeCloseTo(Math.log10(1e-3 / 58.693), 10)
    const scale = unitScale(model, { unit: 'mg/L', asElement: true })
    const inMg = limitOverlay(diagramData(answer, model, { kind: 'solubility', component: 'Ni^2+', scale }), answer.limits, model.limits, model, 'Ni^2+', scale)
    expect(inMg.lines[0]!.y).toBeCloseTo(0, 10)
  })

  it('draws no line on the solubility diagram of another component', () => {
    const data = diagramData(answer, model, { kind: 'solubility', component: 'NH3' })
    expect(limitOverlay(data, answer.limits, model.limits, model, 'NH3').lines).toEqual([])
  })
})

describe('limit sentences', () => {
  it('join several ranges and name other swept variables with their units', () => {
    const window = { quantity: 'dissolved Cu', value: 0.5, unit: 'mg/L', ranges: [[6.1, 7.25], [9.5, 10.0]] as [number, number][] }
    expect(limitSentence({ variable: 'pH', component: null, values: [4, 12] }, window)).toBe('dissolved Cu ≤ 0.5 mg/L from pH 6.10 to 7.25 and from pH 9.50 to 10.00')
    expect(sweptValueText({ variable: 'total', component: 'NH3' }, 0.0123)).toBe('total NH₃ 1.23e-2 mol/L')
    expect(sweptValueText({ variable: 'temperature', component: null }, 35)).toBe('35.0 °C')
  })
})

describe('shortcut factor along the sweep', () => {
  it('plots log10 of each component\'s factor at every converged point, 0 where the hand method holds', () => {
    const data = diagramData(answer, model, { kind: 'shortcut', component: null })
    const nickel = data.series.find((s) => s.key === 'Ni^2+')!
    answer.points.forEach((p, k) => {
      expect(nickel.values[k]).toBeCloseTo(Math.log10(p.shortcut!.components.find((c) => c.name === 'Ni^2+')!.factor), 12)
    })
    // Sulfate forms only HSO4- here: far from its pKa the hand method is exact (factor 1, log 0).
    const sulfate = data.series.find((s) => s.key === 'SO4^2-')!
    expect(Math.max(...sulfate.values.map(Math.abs))).toBeLessThan(0.05)
  })
})
