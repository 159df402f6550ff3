import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsComponentsTable from '../../../components/results/ResultsComponentsTable.vue'
import { copperAmmoniaResult } from '../../unit/results/fixtures'

// Demo fixture: display behaviour only.
describe('ResultsComponentsTable', () => {
  it('says in words how each component was set, with total, dissolved and free', () => {
    const wrapper = mount(ResultsComponentsTable, { props: { components: copperAmmoniaResult().components } })
    const rows = wrapper.findAll('[data-test="component-row"]')
    expect(rows.map((r) => r.get('[data-test="component-name"]').text())).toEqual(['H⁺', 'Cu²⁺', 'NH₃'])
    const cells = rows.map((r) => r.findAll('td').map((td) => td.text()))
    expect(cells[0][1]).toBe('pH held fixed')
    expect(cells[1][1]).toBe('total given')
    expect(cells[1][4]).toBe('1.00e-12')
    expect(wrapper.findAll('th').map((t) => t.text())).toContain('Dissolved (mol/L)')
  })

  it('names the dissolved total and the free ion apart', () => {
    const result = copperAmmoniaResult()
    const wrapper = mount(ResultsComponentsTable, { props: { components: result.components } })
    const copper = wrapper.findAll('[data-test="component-row"]')[1]!
    expect(copper.get('[data-test="component-names"]').text()).toBe('dissolved Cu · free Cu²⁺')
    const dissolved = copper.get('[data-test="dissolved"]')
    expect(dissolved.attributes('aria-label')).toBe(`dissolved Cu: ${dissolved.text()} mol/L`)
    expect(dissolved.text()).not.toBe(copper.findAll('td')[4]!.text())
    // H+ has a proton balance, not a dissolved total a chemist reads: no "dissolved H".
    const proton = wrapper.findAll('[data-test="component-row"]')[0]!
    expect(proton.find('[data-test="component-names"]').exists()).toBe(false)
    expect(proton.get('[data-test="dissolved"]').text()).toBe('—')
  })

  it('asks for a run when there is nothing to show', () => {
    const wrapper = mount(ResultsComponentsTable, { props: { components: null } })
    expect(wrapper.text()).toContain('Run to see the totals.')
  })
})
