import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it, vi } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsTitration from '../../../components/results/ResultsTitration.vue'
import { titration } from '../../../server/solver/index'
import { compile } from '../../../shared/poise/index'
import type { TitrationCurveResult } from '../../../shared/types/result'

// The shipped standardisation of caustic against phthalate (constants from memory).
const text = readFileSync(join(__dirname, '../../../examples/caustic-standardised-against-phthalate.poise'), 'utf8')
const curve = titration(compile(text).model!) as TitrationCurveResult

const saved: { name: string; blob: Blob }[] = []
vi.mock('../../../utils/saveBlob', () => ({ saveBlob: (blob: Blob, name: string) => saved.push({ blob, name }) }))

describe('ResultsTitration', () => {
  it('says the end point in the file\'s unit, marks it on the curve and draws the derivative below', () => {
    const wrapper = mount(ResultsTitration, { props: { titration: curve, fileName: 'demo/khp' } })
    expect(wrapper.find('[data-test="end-point"]').text()).toBe(`end point 1 at ${Number(curve.equivalencePoints[0]!.volume.toPrecision(5))} mL, pH ${curve.equivalencePoints[0]!.pH.toFixed(2)}`)
    expect(wrapper.findAll('[data-test="end-point-mark"]')).toHaveLength(1)
    expect(wrapper.find('[data-test="titration-curve"] path').attributes('d')).toMatch(/^M/)
    expect(wrapper.find('[data-test="titration-derivative"] path').attributes('d')).toMatch(/^M/)
  })

  it('moves the point shown with the slider and exports the whole curve as CSV with volume, pH, β and every species', async () => {
    const wrapper = mount(ResultsTitration, { props: { titration: curve, fileName: 'demo/khp', index: 0, 'onUpdate:index': (i: number) => wrapper.setProps({ index: i }) } })
    await wrapper.find('[data-test="titration-point"]').setValue('500')
    expect(wrapper.text()).toContain(`25 mL · pH ${curve.points[500]!.pH.toFixed(2)}`)
    await wrapper.find('[data-test="titration-csv"]').trigger('click')
    const file = saved.at(-1)!
    expect(file.name).toBe('demo-khp-titration.csv')
    const lines = (await file.blob.text()).replace(/^\uFEFF/, '').trim().split(/\r?\n/)
    expect(lines).toHaveLength(curve.values.length + 1)
    const header = lines[0]!.split(',')
    expect(header.slice(0, 5)).toEqual(['added volume (mL)', 'converged', 'pH', 'dpH/dV (per mL)', 'buffer capacity (mol/L per pH)'])
    for (const name of curve.points[0]!.species.map((s) => s.name)) expect(header).toContain(`${name} (mol/L)`)
  })
})
