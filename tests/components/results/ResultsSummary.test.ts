import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsSummary from '../../../components/results/ResultsSummary.vue'
import ResultsSolidsTable from '../../../components/results/ResultsSolidsTable.vue'
import { carbonateAt, failedPoint } from '../../unit/results/fixtures'

// Demo fixtures: display behaviour only.
describe('ResultsSummary', () => {
  it('shows pH and status of a converged run', () => {
    const wrapper = mount(ResultsSummary, { props: { result: carbonateAt(8.31, 2e-3) } })
    expect(wrapper.find('[data-test="summary-ph"]').text()).toBe('8.310')
    expect(wrapper.find('[data-test="summary-status"]').text()).toBe('converged')
    expect(wrapper.find('[role="alert"]').exists()).toBe(false)
  })

  it('says plainly why a run failed and which equation is furthest from closing', () => {
    const failed = failedPoint('the mass balance of Cu^2+ did not close after 200 iterations')
    failed.residuals.equations = [
      { name: 'mass balance H+', scaled: 1e-6 },
      { name: 'mass balance Cu^2+', scaled: -0.3 },
    ]
    const wrapper = mount(ResultsSummary, { props: { result: failed } })
    const alert = wrapper.find('[role="alert"]').text()
    expect(alert).toContain('did not close after 200 iterations')
    expect(alert).toMatch(/Furthest from closing: mass balance Cu\^2\+ \(-3\.0e-1\); mass balance H\+/)
    expect(wrapper.find('[data-test="summary-ph"]').exists()).toBe(false)
  })
})

describe('ResultsSolidsTable', () => {
  it('marks a suppressed supersaturated solid apart from a present one', () => {
    const wrapper = mount(ResultsSolidsTable, {
      props: {
        solids: [
          { name: 'Cu(OH)2(s)', present: true, amount: 1.4e-3, saturationIndex: 0 },
          { name: 'CuO(s)', present: false, amount: 0, saturationIndex: 0.8, suppressed: true },
        ],
      },
    })
    const rows = wrapper.findAll('[data-test="solid-row"]').map((r) => r.findAll('td').map((td) => td.text()))
    expect(rows[0]).toEqual(['Cu(OH)₂(s)', '0.00', 'present', '1.40e-3'])
    expect(rows[1]).toEqual(['CuO(s)', '0.80', 'supersaturated, suppressed', '0'])
  })

  it('shows "none" with the reason for a solid without a saturation index, and the amount precipitated', () => {
    const wrapper = mount(ResultsSolidsTable, {
      props: {
        solids: [
          { name: 'Zn(OH)2(s)', present: false, amount: 0, precipitated: 0, saturationIndex: null, none: 'none: the total of Zn^2+ is 0' },
          { name: 'Cu(OH)2(s)', present: true, amount: 2e-3, precipitated: 2e-3, saturationIndex: 0 },
        ],
      },
    })
    const rows = wrapper.findAll('[data-test="solid-row"]')
    const cells = rows[0]!.findAll('td')
    expect(cells.map((td) => td.text())).toEqual(['Zn(OH)₂(s)', 'none', 'absent', '0'])
    expect(cells[1]!.attributes('title')).toBe('none: the total of Zn^2+ is 0')
    expect(rows[1]!.findAll('td')[3]!.text()).toBe('2.00e-3')
    expect(wrapper.text()).not.toMatch(/-38\d|-399|NaN|Infinity/)
  })
})
