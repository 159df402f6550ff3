// The map drawn from a real map answer (the shipped copper example on a
// coarse grid): regions of the predominance map labelled inside the plot
// and listed, the colour map with the SI = 0 line, the read-out of a cell.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import ResultsMap from '../../../components/results/ResultsMap.vue'
import { compile } from '../../../shared/poise/index'
import { solveMap } from '../../../server/solver/index'

const source = readFileSync(resolve(import.meta.dirname, '../../../examples/copper-hydroxide-carbonate-map.poise'), 'utf8')
  .replace(/^map .*$/m, 'map pH from 3 to 12 points 19 by total Cu^2+ from 1e-6 to 1e-2 mol/L points 9 log')
const model = compile(source).model!
const map = solveMap(model)

async function mountMap() {
  const wrapper = mount(ResultsMap, { props: { map, model, fileName: 'copper' }, attachTo: document.body })
  for (let i = 0; i < 50 && !wrapper.find('[data-test="map-plot"] svg').exists(); i++) {
    await flushPromises()
    await new Promise((r) => setTimeout(r, 10))
  }
  return wrapper
}

describe('ResultsMap', () => {
  it('draws the predominance of copper: one filled region per dominant holder, each labelled', async () => {
    const wrapper = await mountMap()
    const svg = wrapper.find('[data-test="map-plot"] svg')
    expect(svg.exists()).toBe(true)
    const regions = wrapper.findAll('[aria-label="Regions"] li').map((li) => li.text().replace(/\s*\(\d+ cells\)/, ''))
    // Free Cu²⁺ at low pH and the hydroxide solid at high pH and dose, at least (pKsp 19.66, from memory).
    expect(regions).toEqual(expect.arrayContaining(['Cu²⁺', 'Cu(OH)₂(s)']))
    const labels = svg.findAll('g[aria-label="text"] text').map((t) => t.text())
    // Every region of three cells or more is labelled inside the plot; smaller ones only in the list.
    for (const r of regions) if (!/\((?:1|2) cells\)/.test(wrapper.findAll('[aria-label="Regions"] li').find((li) => li.text().startsWith(r))!.text())) expect(labels).toContain(r)
    expect(svg.findAll('g[aria-label="contour"] path').length).toBeGreaterThanOrEqual(regions.length)
    expect(svg.text()).toContain('Total Cu²⁺ (mol/L)')
    wrapper.unmount()
  })

  it('reads out the chosen cell: where it is and what holds most of the copper there', async () => {
    const wrapper = await mountMap()
    // The top right cell: pH 12, 0.01 mol/L of copper — nearly all of it as the solid.
    await wrapper.setProps({ cell: 8 * 19 + 18 })
    const text = wrapper.find('[data-test="map-readout"]').text()
    expect(text).toContain('pH 12.00, Total Cu²⁺ 1.00e-2 mol/L')
    expect(text).toContain('Cu(OH)₂(s) holds most Cu²⁺')
    expect(text).toContain('solids present: Cu(OH)₂(s)')
    wrapper.unmount()
  })

  it('switches to a colour map of a chosen quantity with the solid boundary drawn over it', async () => {
    const wrapper = await mountMap()
    await wrapper.find('[data-test="map-kind-colour"]').trigger('click')
    await wrapper.find('[data-test="map-quantity"]').setValue('dissolved:Cu^2+')
    await flushPromises()
    // A legend of the quantity, then the plot.
    const svgs = wrapper.findAll('[data-test="map-plot"] figure > svg')
    expect(svgs).toHaveLength(2)
    expect(svgs[0]!.text()).toContain('log10 dissolved Cu (mol/L)')
    const svg = svgs[1]!
    // Filled bands of the quantity on a colour legend, not the predominance regions.
    expect(svg.findAll('g[aria-label="contour"] path[fill]').length).toBeGreaterThan(3)
    expect(wrapper.find('[aria-label="Regions"]').exists()).toBe(false)
    expect(svg.text()).toContain('SI = 0 Cu(OH)₂(s)')
    expect(wrapper.text()).toContain('dashed: where a solid\'s saturation index is 0')
    expect(wrapper.find('[data-test="map-readout"]').text()).toContain('log dissolved Cu')
    wrapper.unmount()
  })
})
