import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/index'
import { exampleFiles } from './helpers'

/** Σ nu_j × (elements, charge) of the components, for a formation row. */
function fromComponents(model: Model, nu: number[]): { elements: Record<string, number>; charge: number } {
  const elements: Record<string, number> = {}
  let charge = 0
  nu.forEach((n, j) => {
    const c = model.components[j]!
    for (const [el, k] of Object.entries(c.elements)) elements[el] = (elements[el] ?? 0) + n * k
    charge += n * c.charge
  })
  return { elements, charge }
}

const examples = exampleFiles()

describe('examples', () => {
  it('there are at least five, covering sweeps, solids, a gas, an excess solid and davies', () => {
    expect(examples.length).toBeGreaterThanOrEqual(5)
    const models = examples.map((e) => compile(e.text).model!)
    expect(models.filter((m) => m.sweep).length).toBeGreaterThanOrEqual(2)
    expect(models.some((m) => m.solids.some((s) => !s.suppressed))).toBe(true)
    expect(models.some((m) => m.components.some((c) => c.mode === 'pressure'))).toBe(true)
    expect(models.some((m) => m.components.some((c) => c.mode === 'excess'))).toBe(true)
    expect(models.some((m) => m.activity === 'davies')).toBe(true)
  })

  for (const { name, text } of examples) {
    describe(name, () => {
      const result = compile(text)
      it('compiles with no errors', () => {
        expect(result.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
        expect(result.model).not.toBeNull()
      })
      it('compiles deterministically', () => {
        expect(compile(text).model).toEqual(result.model)
      })
      it('cites a source for its constants', () => {
        expect(result.model!.reactions.every((r) => r.cite !== null)).toBe(true)
      })
      it('conserves elements and charge in every formation (water aside)', () => {
        const m = result.model!
        for (const row of [...m.species.map((s) => ({ ...s })), ...m.solids.map((s) => ({ ...s, charge: 0 })), ...m.gases.map((g) => ({ ...g, charge: 0 }))]) {
          const sum = fromComponents(m, row.nu)
          expect(row.charge).toBeCloseTo(sum.charge, 9)
          // What the components do not account for must be whole water molecules: H = 2 O, nothing else.
          const rest: Record<string, number> = {}
          for (const el of new Set([...Object.keys(row.elements), ...Object.keys(sum.elements)])) {
            const d = (row.elements[el] ?? 0) - (sum.elements[el] ?? 0)
            if (Math.abs(d) > 1e-9) rest[el] = d
          }
          for (const el of Object.keys(rest)) expect(['H', 'O']).toContain(el)
          expect(rest.H ?? 0).toBeCloseTo(2 * (rest.O ?? 0), 9)
        }
      })
    })
  }
})

describe('compiled formation constants', () => {
  const m = compile(exampleFiles().find((e) => e.name === 'copper-rinse-tank.poise')!.text).model!
  it('solves Cu(OH)2(s) for components: logK = pKsp − 2 pKw, nu = Cu^2+ − 2 H+', () => {
    // Cu(OH)2(s) <=> Cu^2+ + 2 OH- pKsp 19.66, OH- = H2O − H+ with logK −14: formation logK = 19.66 − 28.
    const s = m.solids.find((x) => x.name === 'Cu(OH)2(s)')!
    const h = m.components.findIndex((c) => c.name === 'H+')
    const cu = m.components.findIndex((c) => c.name === 'Cu^2+')
    expect(s.logK).toBeCloseTo(19.66 - 28, 9)
    expect(s.nu[h]).toBe(-2)
    expect(s.nu[cu]).toBe(1)
  })
  it('lists every component as a species with a unit vector and logK 0, and OH- from pKw', () => {
    for (const [j, c] of m.components.entries()) {
      const sp = m.species.find((s) => s.componentIndex === j)!
      expect(sp.name).toBe(c.name)
      expect(sp.logK).toBe(0)
      expect(sp.nu.filter((x) => x !== 0)).toEqual([1])
    }
    expect(m.species.find((s) => s.name === 'OH-')!.logK).toBeCloseTo(-14, 12)
  })
  it('converts the phosphate recipe\'s 3.449 g/L of sodium with its molar mass', () => {
    const p = compile(exampleFiles().find((e) => e.name === 'phosphate-buffer-recipe.poise')!.text).model!
    // Na 22.990 g/mol (IUPAC CIAAW abridged standard atomic weight): 3.449 g/L ≈ 0.1500 mol/L.
    expect(p.components.find((c) => c.name === 'Na+')!.value).toBeCloseTo(3.449 / 22.99, 9)
    expect(p.sweep!.values).toHaveLength(21)
    expect(p.sweep!.values[0]).toBeCloseTo(0.1, 12)
    expect(p.sweep!.values[20]).toBeCloseTo(0.2, 12)
  })
  it('computes a pH sweep with its end points included', () => {
    expect(m.sweep!.values[0]).toBe(6)
    expect(m.sweep!.values[m.sweep!.values.length - 1]).toBe(11)
    expect(m.sweep!.values).toHaveLength(51)
  })
})
