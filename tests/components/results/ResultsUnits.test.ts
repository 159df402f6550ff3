import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { nextTick } from 'vue'
import ResultsSpeciesTable from '../../../components/results/ResultsSpeciesTable.vue'
import ResultsComponentsTable from '../../../components/results/ResultsComponentsTable.vue'
import ResultsUnitPicker from '../../../components/results/ResultsUnitPicker.vue'
import { unitPrefsKey, unitScale, type UnitModel } from '../../../shared/results/units'
import { copperAmmonia, copperAmmoniaResult, stoichiometry } from '../../unit/results/fixtures'

// Demo fixture (a copper-ammonia rinse): what the tables show in another unit.
const result = copperAmmoniaResult()
const elements: Record<string, Record<string, number>> = {
  'H+': { H: 1 }, 'OH-': { O: 1, H: 1 }, 'Cu^2+': { Cu: 1 }, NH3: { N: 1, H: 3 }, 'NH4+': { N: 1, H: 4 },
  'CuNH3^2+': { Cu: 1, N: 1, H: 3 }, 'Cu(NH3)4^2+': { Cu: 1, N: 4, H: 12 }, 'CuOH+': { Cu: 1, O: 1, H: 1 },
}
const unitModel: UnitModel = {
  components: copperAmmonia.components.map((c) => ({ name: c.name, elements: elements[c.name]! })),
  species: copperAmmonia.species.map((s) => ({ name: s.name, elements: elements[s.name]! })),
}

describe('results in another unit', () => {
  it('shows species in mg/L with each formula mass (Cu 63.546, IUPAC Standard atomic weights 2021)', () => {
    const wrapper = mount(ResultsSpeciesTable, {
      props: { result, model: stoichiometry(copperAmmonia), scale: unitScale(unitModel, { unit: 'mg/L', asElement: false }) },
    })
    const headers = wrapper.findAll('th').map((th) => th.text())
    const column = headers.findIndex((h) => h.startsWith('Concentration (mg/L)'))
    expect(column).toBeGreaterThanOrEqual(0)
    const copper = wrapper.findAll('[data-test="species-row"]')[2]!.findAll('td')[column]!.text()
    // 1.00e-12 mol/L × 63.546 g/mol × 1000 mg/g.
    expect(copper).toBe('6.35e-8')
  })

  it('shows totals in µmol/L, and in mg/L as N for ammonia when counted as its element', () => {
    const micro = mount(ResultsComponentsTable, { props: { components: result.components, scale: unitScale(unitModel, { unit: 'µmol/L', asElement: false }) } })
    expect(micro.findAll('th').map((t) => t.text())).toContain('Dissolved (µmol/L)')
    const ammonia = result.components.find((c) => c.name === 'NH3')!
    const asN = mount(ResultsComponentsTable, { props: { components: result.components, scale: unitScale(unitModel, { unit: 'mg/L', asElement: true }) } })
    const row = asN.findAll('[data-test="component-row"]')[2]!
    expect(row.get('[data-test="component-names"]').text()).toBe('dissolved NH₃ · free NH₃ · mg/L as N')
    const expected = (ammonia.dissolved! * 14.007e3).toExponential(2).replace(/e\+?/, 'e')
    expect(row.get('[data-test="dissolved"]').text()).toBe(expected)
  })

  it('states the hardness of a water as CaCO3, and none where there is no Ca or Mg', () => {
    const water = [
      { name: 'Ca^2+', mode: 'total' as const, total: 1e-3, free: 9e-4, dissolved: 1e-3 },
      { name: 'Mg^2+', mode: 'total' as const, total: 5e-4, free: 4e-4, dissolved: 5e-4 },
    ]
    // 1.5 mmol/L × 100.086 g/mol CaCO3 (IUPAC Standard atomic weights 2021) = 150 mg/L.
    const table = mount(ResultsComponentsTable, { props: { components: water } })
    expect(table.get('[data-test="hardness"]').text()).toBe('Hardness (dissolved Ca + Mg): 1.50e2 mg/L as CaCO₃')
    const micro = mount(ResultsComponentsTable, { props: { components: water, scale: unitScale(null, { unit: 'µg/L', asElement: false }) } })
    expect(micro.get('[data-test="hardness"]').text()).toBe('Hardness (dissolved Ca + Mg): 1.50e5 µg/L as CaCO₃')
    expect(mount(ResultsComponentsTable, { props: { components: result.components } }).find('[data-test="hardness"]').exists()).toBe(false)
  })

  it('remembers the unit chosen for a system in the browser', async () => {
    window.localStorage.removeItem(unitPrefsKey('demo/rinse'))
    // eslint-disable-next-line prefer-const
    let picker: ReturnType<typeof mount> | undefined
    picker = mount(ResultsUnitPicker, { props: { systemKey: 'demo/rinse', 'onUpdate:modelValue': (v: unknown) => picker?.setProps({ modelValue: v as never }) } })
    await picker.get('[data-test="output-unit"]').setValue('mg/L')
    await nextTick()
    await nextTick()
    expect(picker.find('[data-test="as-element"]').exists()).toBe(true)
    expect(JSON.parse(window.localStorage.getItem(unitPrefsKey('demo/rinse'))!)).toEqual({ unit: 'mg/L', asElement: false })
    const again = mount(ResultsUnitPicker, { props: { systemKey: 'demo/rinse' } })
    await nextTick()
    expect((again.get('[data-test="output-unit"]').element as HTMLSelectElement).value).toBe('mg/L')
  })
})
