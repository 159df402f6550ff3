import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsShortcut from '../../../components/results/ResultsShortcut.vue'
import { solve } from '../../../server/solver/index'
import { compile } from '../../../shared/poise/index'

// Demo constants: a metal that takes up most of its ligand, so the hand method (ligand in excess) fails.
const model = compile(`system "Ligand depleted"
activity ideal
component H+ pH 9
component Zn^2+ total 10 mmol/L
component C2H3O2- total 12 mmol/L
reaction H2O <=> H+ + OH- pKw 14 cite "demo"
reaction C2H4O2 <=> C2H3O2- + H+ pKa 9.5 cite "demo"
reaction Zn^2+ + C2H3O2- <=> ZnC2H3O2+ logbeta 4 cite "demo"
reaction Zn^2+ + 2 C2H3O2- <=> Zn(C2H3O2)2 logbeta 7 cite "demo"
`).model!
const result = solve(model)

describe('ResultsShortcut', () => {
  it('shows α, the estimate, the exact answer and the factor, and says why a far factor is far', () => {
    const wrapper = mount(ResultsShortcut, { props: { result, model } })
    const zinc = wrapper.findAll('[data-test="shortcut-row"]').find((r) => r.text().startsWith('Zn²⁺'))!
    const entry = result.shortcut!.components.find((c) => c.name === 'Zn^2+')!
    expect(zinc.get('[data-test="shortcut-factor"]').text()).toBe(entry.factor.toFixed(2))
    expect(zinc.get('[data-test="shortcut-factor"]').classes()).toContain('text-caution')
    expect(zinc.get('[data-test="shortcut-why"]').text()).toMatch(/^ligand depletion: C2H3O2- is bound up/)
  })

  it('asks for a run when there is no answer', () => {
    expect(mount(ResultsShortcut, { props: { result: null, model: null } }).text()).toContain('Run to see the hand method')
  })
})
