import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsComponentsTable from '../../../components/results/ResultsComponentsTable.vue'
import { copperAmmoniaResult } from '../../unit/results/fixtures'

// Demo fixture: display behaviour only.
describe('ResultsComponentsTable', () => {
  it('says in words how each component was set, with total, dissolved and free', () => {
    const wrapper = mount(ResultsComponentsTable, { props: { components: copperAmmoniaResult().components } })
    const rows = wrapper.findAll('[data-test="component-row"]').map((r) => r.findAll('td').map((td) => td.text()))
    expect(rows.map((r) => r[0])).toEqual(['H⁺', 'Cu²⁺', 'NH₃'])
    expect(rows[0][1]).toBe('pH held fixed')
    expect(rows[1][1]).toBe('total given')
    expect(rows[1][4]).toBe('1.00e-12')
    expect(wrapper.findAll('th').map((t) => t.text())).toContain('Dissolved (mol/L)')
  })

  it('asks for a run when there is nothing to show', () => {
    const wrapper = mount(ResultsComponentsTable, { props: { components: null } })
    expect(wrapper.text()).toContain('Run to see the totals.')
  })
})
