import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsSweepTable from '../../../components/results/ResultsSweepTable.vue'
import { sweep } from '../../../server/solver/index'
import { compile } from '../../../shared/poise/index'
import { unitScale } from '../../../shared/results/units'

// The shipped nickel rinse (constants from memory): the report's table of every sweep point.
const model = compile(readFileSync(join(__dirname, '../../../examples/nickel-rinse-discharge.poise'), 'utf8')).model!
const answer = sweep(model)

describe('ResultsSweepTable', () => {
  it('has a row for every point with its dissolved totals in the chosen unit', () => {
    const wrapper = mount(ResultsSweepTable, { props: { sweep: answer, model, scale: unitScale(model, { unit: 'mg/L', asElement: true }) } })
    const rows = wrapper.findAll('tbody tr')
    expect(rows).toHaveLength(answer.values.length)
    const headers = wrapper.findAll('th').map((th) => th.text())
    const column = headers.indexOf('dissolved Ni (mg/L as Ni)')
    expect(column).toBeGreaterThan(0)
    // pH 7: nothing precipitates, so all 30 mg/L of nickel is dissolved.
    expect(rows[0]!.findAll('td')[column]!.text()).toBe('3.00e1')
    expect(rows[0]!.findAll('td')[0]!.text()).toBe('pH 7.00')
    const last = answer.points.at(-1)!.components.find((c) => c.name === 'Ni^2+')!.dissolved! * 58.693e3
    expect(rows.at(-1)!.findAll('td')[column]!.text()).toBe(last.toExponential(2).replace(/e\+?/, 'e'))
    expect(rows.at(-1)!.text()).toContain('Ni(OH)₂(s)')
  })
})
