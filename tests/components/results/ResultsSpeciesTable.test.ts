import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsSpeciesTable from '../../../components/results/ResultsSpeciesTable.vue'
import type { Result } from '../../../shared/types/result'
import type { StoichiometryModel } from '../../../shared/results/share'
import { copperAmmonia, copperAmmoniaResult, stoichiometry } from '../../unit/results/fixtures'

// Demo fixture (a copper-ammonia rinse at pH 9.5): checks the table's behaviour, not chemistry.
const result = copperAmmoniaResult()
const model = stoichiometry(copperAmmonia)

function mountTable(props: { result: Result | null; model?: StoichiometryModel } = { result, model }) {
  return mount(ResultsSpeciesTable, { props })
}

const firstCells = (wrapper: ReturnType<typeof mountTable>) =>
  wrapper.findAll('[data-test="species-row"]').map((r) => r.find('td').text())

function column(wrapper: ReturnType<typeof mountTable>, header: string): string[] {
  const headers = wrapper.findAll('th').map((th) => th.text())
  const index = headers.findIndex((h) => h.startsWith(header))
  expect(index).toBeGreaterThanOrEqual(0)
  return wrapper.findAll('[data-test="species-row"]').map((r) => r.findAll('td')[index].text())
}

describe('ResultsSpeciesTable', () => {
  it('shows every species, typeset', () => {
    const wrapper = mountTable()
    expect(firstCells(wrapper)).toEqual(['H⁺', 'OH⁻', 'Cu²⁺', 'NH₃', 'NH₄⁺', 'CuNH₃²⁺', 'Cu(NH₃)₄²⁺', 'CuOH⁺'])
  })

  it('sorts by concentration, largest first, and the other way on a second press', async () => {
    const wrapper = mountTable()
    await wrapper.find('[data-test="sort-concentration"]').trigger('click')
    expect(firstCells(wrapper)).toEqual(['NH₃', 'NH₄⁺', 'OH⁻', 'Cu(NH₃)₄²⁺', 'CuNH₃²⁺', 'H⁺', 'CuOH⁺', 'Cu²⁺'])
    expect(column(wrapper, 'Concentration')[0]).toBe('5.00e-2')
    const th = wrapper.findAll('th').find((t) => t.text().startsWith('Concentration'))!
    expect(th.attributes('aria-sort')).toBe('descending')
    await wrapper.find('[data-test="sort-concentration"]').trigger('click')
    expect(firstCells(wrapper)).toEqual(['Cu²⁺', 'CuOH⁺', 'H⁺', 'CuNH₃²⁺', 'Cu(NH₃)₄²⁺', 'OH⁻', 'NH₄⁺', 'NH₃'])
    expect(th.attributes('aria-sort')).toBe('ascending')
  })

  it('hides the rows the filter does not match, by caret or typeset name', async () => {
    const wrapper = mountTable()
    await wrapper.find('[data-test="species-filter"]').setValue('NH3')
    expect(firstCells(wrapper)).toEqual(['NH₃', 'CuNH₃²⁺', 'Cu(NH₃)₄²⁺'])
    await wrapper.find('[data-test="species-filter"]').setValue('zinc')
    expect(firstCells(wrapper)).toEqual([])
    expect(wrapper.find('[data-test="species-no-match"]').text()).toContain('zinc')
    await wrapper.find('[data-test="species-filter"]').setValue('')
    expect(firstCells(wrapper).length).toBe(result.species.length)
  })

  it('switches the concentration column between mol/L and log10', async () => {
    const wrapper = mountTable()
    expect(column(wrapper, 'Concentration')[2]).toBe('1.00e-12')
    await wrapper.find('[data-test="scale-log"]').trigger('click')
    expect(column(wrapper, 'log₁₀ concentration (mol/L)')[2]).toBe('-12.00')
    expect(wrapper.find('[data-test="scale-log"]').attributes('aria-pressed')).toBe('true')
    await wrapper.find('[data-test="scale-linear"]').trigger('click')
    expect(column(wrapper, 'Concentration')[2]).toBe('1.00e-12')
  })

  it('shows each species share of the chosen component and lets the reader pick another', async () => {
    const wrapper = mountTable()
    const shares = column(wrapper, 'Share of dissolved Cu²⁺')
    expect(shares[0]).toBe('—') // H+ holds no copper
    expect(shares[2]).toMatch(/ %$/) // free Cu2+ holds copper, however small its share
    await wrapper.find('[data-test="share-component"]').setValue('NH3')
    expect(wrapper.emitted('update:component')?.at(-1)).toEqual(['NH3'])
    expect(column(wrapper, 'Share of dissolved NH₃').length).toBe(result.species.length)
  })

  it('marks a species without the chosen component with a dash that says so, not 0 %', () => {
    const wrapper = mountTable()
    const headers = wrapper.findAll('th').map((th) => th.text())
    const index = headers.findIndex((h) => h.startsWith('Share of dissolved Cu²⁺'))
    const hydroxide = wrapper.findAll('[data-test="species-row"]')[1].findAll('td')[index]
    expect(hydroxide.text()).toBe('—')
    expect(hydroxide.attributes('title')).toBe('does not contain Cu²⁺')
    expect(hydroxide.attributes('aria-label')).toBe('does not contain Cu²⁺')
    const copperHydroxide = wrapper.findAll('[data-test="species-row"]')[7].findAll('td')[index]
    expect(copperHydroxide.text()).toMatch(/^\d+\.\d %$/)
    expect(copperHydroxide.attributes('title')).toBeUndefined()
  })

  it('tells the reader to run when there is no result, and leaves out the share without a model', () => {
    const empty = mountTable({ result: null })
    expect(empty.find('[data-test="species-empty"]').text()).toBe('Run to see the species.')
    expect(empty.findAll('[data-test="species-row"]')).toHaveLength(0)
    const noModel = mountTable({ result })
    expect(noModel.findAll('th').map((t) => t.text()).some((h) => h.startsWith('Share'))).toBe(false)
  })

  it('shows no numbers for a run that did not converge', () => {
    const wrapper = mountTable({ result: { ...result, converged: false, reason: 'no convergence' }, model })
    expect(wrapper.findAll('[data-test="species-row"]')).toHaveLength(0)
    expect(wrapper.find('[data-test="species-empty"]').text()).toMatch(/did not converge/)
  })

  it('shows "none" with the reason where a species has no log10 (a component of total 0)', () => {
    const absent = { ...result, species: result.species.map((s) => (s.name === 'Cu^2+' ? { ...s, concentration: 0, activity: 0, log10: null, none: 'none: the total of Cu^2+ is 0' } : s)) }
    const wrapper = mountTable({ result: absent, model })
    const row = wrapper.findAll('[data-test="species-row"]').find((r) => r.find('td').text() === 'Cu²⁺')!
    const headers = wrapper.findAll('th').map((th) => th.text())
    const cell = row.findAll('td')[headers.findIndex((h) => h.startsWith('log₁₀ c'))]!
    expect(cell.text()).toBe('none')
    expect(cell.attributes('title')).toBe('none: the total of Cu^2+ is 0')
  })
})
