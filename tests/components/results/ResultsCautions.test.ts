import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsCautions from '../../../components/results/ResultsCautions.vue'
import type { SweepResult } from '../../../shared/types/result'
import { carbonate, carbonateAt, stoichiometry, sulfide, sulfideAt } from '../../unit/results/fixtures'

// Demo fixtures: sulfide at pH 6 (H2S dominates, below pKa1 ≈ 7, from memory) and pH 10 (HS- dominates).
const model = stoichiometry(sulfide)

describe('ResultsCautions', () => {
  it('raises an alert when H2S is most of the dissolved sulfide', () => {
    const wrapper = mount(ResultsCautions, { props: { result: sulfideAt(6), model, activity: 'davies' } })
    const alert = wrapper.find('[role="alert"]')
    expect(alert.exists()).toBe(true)
    expect(alert.text()).toContain('H₂S is 91 % of the dissolved sulfide')
    expect(alert.text()).toMatch(/ventilation/)
    expect(wrapper.find('[data-test="acidification-note"]').exists()).toBe(false)
  })

  it('keeps only the acidification note when sulfide is mostly HS-', () => {
    const wrapper = mount(ResultsCautions, { props: { result: sulfideAt(10), model } })
    expect(wrapper.find('[role="alert"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="acidification-note"]').text()).toMatch(/acidifying it converts sulfide/)
  })

  it('warns over a sweep at the point where H2S peaks', () => {
    const values = [5, 7, 9]
    const sweep: SweepResult = { variable: 'pH', component: null, values, points: values.map(sulfideAt) }
    const wrapper = mount(ResultsCautions, { props: { sweep, model } })
    expect(wrapper.find('[role="alert"]').text()).toContain('at pH 5.0')
  })

  it('always shows the model-limits footer, and no warning for a harmless system', () => {
    const wrapper = mount(ResultsCautions, { props: { result: carbonateAt(8, 1e-3), model: stoichiometry(carbonate) } })
    expect(wrapper.find('[role="alert"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="model-limits"]').text()).toMatch(/assume the solution has reached equilibrium/)
  })
})
