// The ± of a single solve in the workbench's tables, from a real solve of a
// model whose constants carry a ± (so the numbers are the solver's own).
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsSpeciesTable from '../../../components/results/ResultsSpeciesTable.vue'
import ResultsSolidsTable from '../../../components/results/ResultsSolidsTable.vue'
import ResultsComponentsTable from '../../../components/results/ResultsComponentsTable.vue'
import ResultsSummary from '../../../components/results/ResultsSummary.vue'
import { compile } from '../../../shared/poise/index'
import { solve } from '../../../server/solver/index'
import { resultCsv } from '../../../shared/results/export'

// Constants from memory (acetic acid pKa 4.76, calcite pKsp 8.48, carbonic acid 6.35/10.33); the ± are invented.
const text = (withUncertainty: boolean) => `system "Acetate rinse with a little lime"
component H+ balance
component CH3COO- total 10 mmol/L
component Na+ total 5 mmol/L
component Ca^2+ total 0.1 mmol/L
component CO3^2- total 0.1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76${withUncertainty ? ' ± 0.05' : ''} cite "from memory"
reaction HCO3- <=> CO3^2- + H+ pKa 10.33 cite "from memory"
reaction H2CO3 <=> HCO3- + H+ pKa 6.35 cite "from memory"
reaction CaCO3(s) <=> Ca^2+ + CO3^2- pKsp 8.48${withUncertainty ? ' ± 0.2' : ''} cite "from memory"
`
const solved = (withUncertainty: boolean) => solve(compile(text(withUncertainty)).model!)

function column(wrapper: ReturnType<typeof mount>, header: string, rowTest: string): string[] {
  const headers = wrapper.findAll('th').map((th) => th.text())
  const index = headers.findIndex((h) => h.startsWith(header))
  if (index < 0) return []
  return wrapper.findAll(`[data-test="${rowTest}"]`).map((r) => r.findAll('td')[index]!.text())
}

describe('the ± of a single solve in the tables', () => {
  it('shows a ± log10 c column with the constant behind most of it, and says how it was found', () => {
    const result = solved(true)
    const wrapper = mount(ResultsSpeciesTable, { props: { result } })
    const names = wrapper.findAll('[data-test="species-row"]').map((r) => r.find('td').text())
    const pm = column(wrapper, '± log₁₀ c', 'species-row')
    const hydroxide = result.species.find((s) => s.name === 'OH-')!.log10Uncertainty!
    // Half neutralised, the pH sits at the pKa: its ± passes almost wholly into the pH and so into log c of OH−.
    expect(hydroxide.sigma).toBeGreaterThan(0.045)
    expect(pm[names.indexOf('OH⁻')]).toBe(`± ${hydroxide.sigma.toFixed(2)}`)
    const index = wrapper.findAll('th').map((th) => th.text()).findIndex((h) => h.startsWith('± log₁₀ c'))
    const cell = wrapper.findAll('[data-test="species-row"]')[names.indexOf('OH⁻')]!.findAll('td')[index]!
    expect(cell.attributes('title')).toMatch(/^mostly CH3COOH <=> CH3COO- \+ H\+ \(\d+ % of the variance\)$/)
    expect(wrapper.find('[data-test="uncertainty-note"]').text()).toContain('from the 2 constants with a ±, propagated linearly')
  })

  it('shows ± SI, ± dissolved and the pH’s ±', () => {
    const result = solved(true)
    const solids = mount(ResultsSolidsTable, { props: { solids: result.solids } })
    const si = result.solids[0]!.saturationIndexUncertainty!
    expect(solids.find('[data-test="solid-uncertainty"]').text()).toBe(`± ${si.sigma.toFixed(2)}`)
    // The undersaturated solid's index moves one to one with its own pKsp (± 0.2), more than with the pH (± 0.05).
    expect(solids.find('[data-test="solid-uncertainty"]').attributes('title')).toMatch(/^mostly CaCO3\(s\) <=> Ca\^2\+ \+ CO3\^2- \(\d+ % of the variance\)$/)
    const totals = mount(ResultsComponentsTable, { props: { components: result.components } })
    expect(totals.findAll('th').map((t) => t.text())).toContain('± dissolved')
    expect(totals.findAll('[data-test="dissolved-uncertainty"]').map((c) => c.text())[1]).toMatch(/^± \d\.\de-\d+$|^± 0$/)
    const summary = mount(ResultsSummary, { props: { result } })
    expect(summary.find('[data-test="summary-ph-uncertainty"]').text()).toBe(`± ${result.pHUncertainty!.sigma.toFixed(2)}`)
    expect(summary.find('[data-test="summary-ph-main"]').text()).toContain('mostly CH3COOH <=> CH3COO- + H+')
  })

  it('shows no ± column when no constant carries a ±', () => {
    const result = solved(false)
    expect(column(mount(ResultsSpeciesTable, { props: { result } }), '± log₁₀ c', 'species-row')).toEqual([])
    expect(mount(ResultsSolidsTable, { props: { solids: result.solids } }).find('[data-test="solid-uncertainty"]').exists()).toBe(false)
    expect(mount(ResultsSummary, { props: { result } }).find('[data-test="summary-ph-uncertainty"]').exists()).toBe(false)
  })

  it('writes the ± into the CSV beside each value, with the main constant', () => {
    const result = solved(true)
    const csv = resultCsv(result)
    const sigma = result.species.find((s) => s.name === 'CH3COOH')!.log10Uncertainty!.sigma
    expect(csv).toContain(`species,CH3COOH,log10 concentration ±,${sigma},log10(mol/L)\r\n`)
    expect(csv).toContain('species,CH3COOH,log10 concentration ± mostly from,CH3COOH <=> CH3COO- + H+,')
    expect(csv).toContain(`conditions,,pH ±,${result.pHUncertainty!.sigma},\r\n`)
    expect(csv).toContain('constant,CaCO3(s) <=> Ca^2+ + CO3^2-,pKsp uncertainty in log10 K,0.2,\r\n')
    expect(resultCsv(solved(false))).not.toContain('±')
  })
})

describe('the Monte Carlo band of a titration curve', () => {
  it('shades the pH band under the curve and says how many draws made it', async () => {
    const ResultsTitration = (await import('../../../components/results/ResultsTitration.vue')).default
    const { titration } = await import('../../../server/solver/index')
    // Acetic acid (pKa 4.76 from memory, ± invented) titrated with caustic soda.
    const curve = titration(compile(`system "Vinegar titrated"
component H+ balance
component CH3COO- total 10 mmol/L
component Na+ total 0 mol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
reaction CH3COOH <=> CH3COO- + H+ pKa 4.76 ± 0.05 cite "from memory"
sample volume 25 mL
titrant Na+ 0.1 mol/L
titrant OH- 0.1 mol/L
titrate from 0 to 3 mL points 13
uncertainty draws 40 seed 2
`).model!)
    const wrapper = mount(ResultsTitration, { props: { titration: curve, fileName: 'demo/vinegar' } })
    expect(wrapper.findAll('[data-test="titration-band"]').length).toBeGreaterThan(0)
    expect(wrapper.find('[data-test="titration-band-note"]').text()).toContain('Monte Carlo over the 1 constant with a ±: 40 draws (seed 2)')
    expect(wrapper.text()).toMatch(/pH \d\.\d\d \(95 %: \d\.\d\d–\d\.\d\d\)/)
  })
})

describe('the Monte Carlo band in the report’s table of sweep points', () => {
  it('adds the pH band and a ± to each dissolved total, and says how they were found', async () => {
    const ResultsSweepTable = (await import('../../../components/results/ResultsSweepTable.vue')).default
    const { sweep } = await import('../../../server/solver/index')
    const model = compile(text(true) + 'sweep total Na+ from 2 mmol/L to 8 mmol/L points 4\nuncertainty draws 40 seed 4\n').model!
    const answer = sweep(model)
    const wrapper = mount(ResultsSweepTable, { props: { sweep: answer, model } })
    const band = answer.points[1]!.pHUncertainty!
    expect(wrapper.findAll('[data-test="sweep-ph-band"]')[1]!.text()).toBe(`${band.low!.toFixed(2)}–${band.high!.toFixed(2)}`)
    expect(wrapper.find('[data-test="sweep-band-note"]').text()).toContain('40 draws (seed 4)')
    const plain = compile(text(false) + 'sweep total Na+ from 2 mmol/L to 8 mmol/L points 4\n').model!
    expect(mount(ResultsSweepTable, { props: { sweep: sweep(plain), model: plain } }).find('[data-test="sweep-ph-band"]').exists()).toBe(false)
  })
})
