import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsComponentsTable from '../../../components/results/ResultsComponentsTable.vue'
import { copperAmmoniaResult } from '../../unit/results/fixtures'
import { unitScale } from '../../../shared/results/units'

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

  it('turns a negative proton total into the strong base it equals, in the shown molar unit', () => {
    const components = copperAmmoniaResult().components.map((c) => (c.name === 'H+' ? { ...c, mode: 'total' as const, total: -2.5e-3 } : c))
    const wrapper = mount(ResultsComponentsTable, { props: { components, scale: unitScale(null, { unit: 'mmol/L', asElement: false }) } })
    const proton = wrapper.findAll('[data-test="component-row"]')[0]!
    expect(proton.get('[data-test="strong-base"]').text()).toBe('equivalent to 2.50e0 mmol/L of strong base')
    // In a mass unit the base is still counted in moles (mmol/L): "mg/L of strong base" would name no substance.
    const inMass = mount(ResultsComponentsTable, { props: { components, scale: unitScale(null, { unit: 'mg/L', asElement: false }) } })
    expect(inMass.get('[data-test="strong-base"]').text()).toBe('equivalent to 2.50e0 mmol/L of strong base')
    // Other components, and a positive proton total, say nothing of the kind.
    expect(wrapper.findAll('[data-test="strong-base"]')).toHaveLength(1)
    const acid = mount(ResultsComponentsTable, { props: { components: components.map((c) => (c.name === 'H+' ? { ...c, total: 1e-3 } : c)) } })
    expect(acid.find('[data-test="strong-base"]').exists()).toBe(false)
  })

  it('says what a pH sweep holds, and what the H+ total means with the pH held', () => {
    const components = copperAmmoniaResult().components
    const sweep = mount(ResultsComponentsTable, { props: { components, sweepVariable: 'pH' } })
    expect(sweep.get('[data-test="held-ph"]').text()).toMatch(/^A pH sweep holds the pH at each point’s value and every other total as written; the H\+ total is the acid \(positive\) or strong base \(negative\) it takes/)
    const held = mount(ResultsComponentsTable, { props: { components } })
    expect(held.get('[data-test="held-ph"]').text()).toMatch(/^The pH is held: the H\+ total/)
    const free = mount(ResultsComponentsTable, { props: { components: components.map((c) => (c.name === 'H+' ? { ...c, mode: 'balance' as const } : c)), sweepVariable: 'total' } })
    expect(free.find('[data-test="held-ph"]').exists()).toBe(false)
  })
})
