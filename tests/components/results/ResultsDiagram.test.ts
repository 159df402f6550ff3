import { beforeEach, describe, expect, it } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import ResultsDiagram from '../../../components/results/ResultsDiagram.vue'
import { diagramPrefsKey } from '../../../shared/results/diagramPrefs'
import { carbonate, carbonateSweep, copperAmmonia, solvedAt, stoichiometry } from '../../unit/results/fixtures'
import type { SweepResult } from '../../../shared/types/result'

// Demo fixture: a 2 mmol/L carbonate pH sweep with one failed point.
const sweep = carbonateSweep()
const model = stoichiometry(carbonate)

async function mountDiagram(props: Partial<InstanceType<typeof ResultsDiagram>['$props']> = {}) {
  const wrapper = mount(ResultsDiagram, { props: { sweep, model, systemKey: 'demo/carbonate', ...props }, attachTo: document.body })
  // Plot is imported after mounting; wait until it has drawn.
  for (let i = 0; i < 50 && !wrapper.find('[data-test="diagram-plot"] svg').exists(); i++) {
    await flushPromises()
    await new Promise((r) => setTimeout(r, 10))
  }
  return wrapper
}

beforeEach(() => window.localStorage.clear())

describe('ResultsDiagram', () => {
  it('draws an SVG line for each carbonate species and notes the gap', async () => {
    const wrapper = await mountDiagram()
    const svg = wrapper.find('[data-test="diagram-plot"] svg')
    expect(svg.exists()).toBe(true)
    expect(svg.text()).toContain('Fraction of dissolved CO₃²⁻')
    expect(wrapper.findAll('[aria-label="Series"] li').map((li) => li.text())).toEqual(['CO₃²⁻', 'HCO₃⁻', 'H₂CO₃'])
    expect(wrapper.find('[data-test="diagram-gaps"]').text()).toContain('1 of 17 points did not converge')
    // Each line is one path in the Okabe–Ito colour of its species' index in the model; the failed point splits it into two runs (two moveto's).
    const lines = svg.findAll('g[aria-label="line"] path')
    expect(lines.map((p) => p.attributes('stroke'))).toEqual(['#4897C4', '#009E73', '#9A922A']) // model indices 2, 3, 4
    for (const line of lines) expect(line.attributes('d')!.match(/M/g)).toHaveLength(2)
    wrapper.unmount()
  })

  it('switches kind with the segmented control and remembers the choice for the system', async () => {
    const wrapper = await mountDiagram()
    await wrapper.find('[data-test="kind-solubility"]').trigger('click')
    expect(wrapper.find('[data-test="kind-solubility"]').attributes('aria-pressed')).toBe('true')
    expect(wrapper.emitted('update:kind')?.at(-1)).toEqual(['solubility'])
    expect(JSON.parse(window.localStorage.getItem(diagramPrefsKey('demo/carbonate'))!).kind).toBe('solubility')
    wrapper.unmount()
    const again = await mountDiagram()
    expect(again.find('[data-test="kind-solubility"]').attributes('aria-pressed')).toBe('true')
    again.unmount()
    const other = await mountDiagram({ systemKey: 'demo/other' })
    expect(other.find('[data-test="kind-distribution"]').attributes('aria-pressed')).toBe('true')
    other.unmount()
  })

  it('offers the components that can be shared out and emits the pick', async () => {
    const values = [8, 9, 10]
    const ammonia: SweepResult = {
      variable: 'pH',
      component: null,
      values,
      points: values.map((pH) => solvedAt(copperAmmonia, [-pH, -12, Math.log10(0.05)])),
    }
    const wrapper = await mountDiagram({ sweep: ammonia, model: stoichiometry(copperAmmonia), systemKey: 'demo/rinse' })
    const select = wrapper.find('[data-test="diagram-component"]')
    expect(select.findAll('option').map((o) => o.text())).toEqual(['Cu²⁺', 'NH₃'])
    await select.setValue('NH3')
    expect(wrapper.emitted('update:component')?.at(-1)).toEqual(['NH3'])
    wrapper.unmount()
  })

  it('asks for a sweep when there is none', async () => {
    const wrapper = await mountDiagram({ sweep: null })
    expect(wrapper.find('[data-test="diagram-empty"]').text()).toMatch(/Add a sweep/)
    wrapper.unmount()
  })

  it('lets the reader choose the share below which curves hide', async () => {
    const wrapper = await mountDiagram()
    expect(wrapper.text()).toContain('Show species below 0.1 %')
    await wrapper.get('[data-test="diagram-floor"]').setValue('0.05')
    await flushPromises()
    expect(wrapper.text()).toContain('Show species below 5.0 %')
  })
})
