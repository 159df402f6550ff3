// The workbench's own controls: keyboard tabs, the sweep point slider, the
// save/run bar's words, the conflict view and the example picker.
import { afterEach, describe, expect, it } from 'vitest'
import { mount, type VueWrapper } from '@vue/test-utils'
import { nextTick } from 'vue'
import WorkbenchTabs from '../../../components/workbench/WorkbenchTabs.vue'
import WorkbenchPointPicker from '../../../components/workbench/WorkbenchPointPicker.vue'
import WorkbenchActions from '../../../components/workbench/WorkbenchActions.vue'
import WorkbenchRunNote from '../../../components/workbench/WorkbenchRunNote.vue'
import WorkbenchConflict from '../../../components/workbench/WorkbenchConflict.vue'
import WorkbenchExamplePicker from '../../../components/workbench/WorkbenchExamplePicker.vue'
import type { SweepResult } from '../../../shared/types/result'
import { runFixture } from '../../fixtures/answers'

let wrapper: VueWrapper | null = null
afterEach(() => {
  wrapper?.unmount()
  wrapper = null
})

const TABS = [{ id: 'species', label: 'Species' }, { id: 'solids', label: 'Solids' }, { id: 'report', label: 'Report' }]

describe('WorkbenchTabs', () => {
  it('moves the choice and the focus with the arrow keys, wrapping around, one tab in the Tab order', async () => {
    wrapper = mount(WorkbenchTabs, {
      props: { tabs: TABS, idBase: 't', label: 'Results', modelValue: 'species', 'onUpdate:modelValue': (v: string) => wrapper!.setProps({ modelValue: v }) },
      attachTo: document.body,
    })
    const tabs = () => wrapper!.findAll('[role=tab]')
    expect(tabs().map((t) => t.attributes('tabindex'))).toEqual(['0', '-1', '-1'])
    await tabs()[0]!.trigger('keydown', { key: 'ArrowLeft' })
    await nextTick()
    expect(tabs()[2]!.attributes('aria-selected')).toBe('true')
    expect(document.activeElement).toBe(tabs()[2]!.element)
    await tabs()[2]!.trigger('keydown', { key: 'Home' })
    await nextTick()
    expect(tabs()[0]!.attributes('aria-selected')).toBe('true')
    expect(wrapper.find('[role=tabpanel]').attributes('aria-labelledby')).toBe('t-tab-species')
  })
})

describe('WorkbenchPointPicker', () => {
  const point = (converged: boolean) => ({ converged, iterations: 1, temperatureC: 25, pH: 7, ionicStrength: 0, species: [], solids: [], components: [], residuals: { maxScaled: 0 } })
  const sweep: SweepResult = { variable: 'total', component: 'Na+', values: [0.1, 0.15, 0.2], points: [point(true), point(false), point(true)] }

  it('writes out the swept value of the chosen point and says when it did not converge', async () => {
    wrapper = mount(WorkbenchPointPicker, { props: { sweep, modelValue: 1 } })
    expect(wrapper.find('[data-test=sweep-point-value]').text()).toBe('total Na⁺ 1.50e-1 mol/L')
    expect(wrapper.text()).toContain('2 of 3, did not converge')
    await wrapper.find('input').setValue('2')
    expect(wrapper.emitted('update:modelValue')!.at(-1)).toEqual([2])
  })

  it('names pH and temperature sweeps in their own units', () => {
    wrapper = mount(WorkbenchPointPicker, { props: { sweep: { ...sweep, variable: 'pH', component: null, values: [4, 4.5, 5] }, modelValue: 1 } })
    expect(wrapper.find('[data-test=sweep-point-value]').text()).toBe('pH 4.50')
    wrapper.unmount()
    wrapper = mount(WorkbenchPointPicker, { props: { sweep: { ...sweep, variable: 'temperature', component: null, values: [5, 6, 7] }, modelValue: 9 } })
    expect(wrapper.find('[data-test=sweep-point-value]').text()).toBe('7.0 °C')
  })
})

describe('WorkbenchActions', () => {
  const base = { canEdit: true, dirty: false, plan: 'stored' as const, revision: 3, running: false, saving: false, role: 'editor' }

  it('says a clean text runs as a stored run of the revision, and has nothing to save', () => {
    wrapper = mount(WorkbenchActions, { props: base })
    expect(wrapper.find('[data-test=run-hint]').text()).toBe('Run solves revision 3 and keeps the run with it.')
    expect(wrapper.find('[data-test=save]').attributes('disabled')).toBeDefined()
    expect(wrapper.find('[data-test=run]').text()).toMatch(/^Run\s/)
  })

  it('offers the next revision and a preview run when the text has changed', async () => {
    wrapper = mount(WorkbenchActions, { props: { ...base, dirty: true, plan: 'preview' as const } })
    expect(wrapper.find('[data-test=save]').text()).toMatch(/Save as revision 4/)
    expect(wrapper.find('[data-test=run]').text()).toMatch(/Run preview/)
    expect(wrapper.find('[data-test=run-hint]').text()).toMatch(/preview, not stored/)
    await wrapper.find('form').trigger('submit')
    expect(wrapper.emitted('save')).toHaveLength(1)
  })

  it('gives a viewer Run only, as a preview that stores nothing, and says so', async () => {
    wrapper = mount(WorkbenchActions, { props: { ...base, canEdit: false, plan: 'preview' as const, role: 'viewer' } })
    expect(wrapper.find('[data-test=save]').exists()).toBe(false)
    expect(wrapper.find('[data-test=revision-message]').exists()).toBe(false)
    expect(wrapper.find('[data-test=run-hint]').text()).toBe('You are viewer here: the text is read-only. Run solves revision 3 as a preview; viewers\' runs are not stored.')
    expect(wrapper.find('[data-test=run]').text()).toMatch(/Run preview/)
    await wrapper.find('[data-test=run]').trigger('click')
    expect(wrapper.emitted('run')).toHaveLength(1)
  })

  it('tells a reviewer that Run keeps the run', () => {
    wrapper = mount(WorkbenchActions, { props: { ...base, canEdit: false, role: 'reviewer' } })
    expect(wrapper.find('[data-test=run-hint]').text()).toBe('You are reviewer here: the text is read-only. Run solves revision 3 and keeps the run with it.')
  })
})

describe('WorkbenchRunNote', () => {
  const result = { converged: true, iterations: 3, temperatureC: 25, pH: 3, ionicStrength: 1e-3, species: [], solids: [], components: [], residuals: { maxScaled: 0 } } as never
  const stored = {
    origin: 'stored' as const, kind: 'single' as const, source: '', result, model: null, solverVersion: '1.0.0', compilerVersion: '1.0.0', solverMs: 4, at: '2026-12-01T10:05:00.000Z',
    // Run 12 of the system, stored as row 4031 of the lab's server.
    run: runFixture(4031, { number: 12, revision: 3, compilerVersion: '1.0.0', storedModel: true }),
  }

  it('names the solver and compiler of a stored run, and says nothing of a recompile when it kept its model', () => {
    wrapper = mount(WorkbenchRunNote, { props: { shown: stored, stale: false, recompiled: false } })
    expect(wrapper.text()).toMatch(/Run 12 of revision 3.*solver 1\.0\.0 · compiler 1\.0\.0/)
    expect(wrapper.find('[data-test=run-recompiled]').exists()).toBe(false)
  })

  it('says when a run predates stored models and its tables are a recompile', () => {
    wrapper = mount(WorkbenchRunNote, { props: { shown: { ...stored, compilerVersion: null }, stale: false, recompiled: true } })
    expect(wrapper.text()).not.toMatch(/compiler/)
    expect(wrapper.find('[data-test=run-recompiled]').text()).toMatch(/stored before runs kept their model.*today's compile of its text/)
  })

  it('labels a viewer\'s preview of the saved revision as not stored', () => {
    const { run: _run, ...rest } = stored
    wrapper = mount(WorkbenchRunNote, { props: { shown: { ...rest, origin: 'preview' as const, ofRevision: 3, reason: 'viewer' as const }, stale: false } })
    expect(wrapper.find('[data-test=preview-label]').text()).toMatch(/^Preview of revision 3 — not stored\. Viewers' runs are previews: nothing is kept\.\s+\(1 Dec 2026/)
  })

  it('says a preview made on opening was solved because no run of the revision is stored', () => {
    const { run: _run, ...rest } = stored
    wrapper = mount(WorkbenchRunNote, { props: { shown: { ...rest, origin: 'preview' as const, ofRevision: 3, reason: 'opened' as const }, stale: false } })
    expect(wrapper.find('[data-test=preview-label]').text()).toMatch(/^Preview of revision 3 — not stored\. No run of this revision is stored yet, so it was solved on opening\.\s+\(/)
  })
})

describe('WorkbenchConflict', () => {
  const conflict = {
    mine: 'system "A"\ncomponent Cl- total 5 mmol/L\n',
    theirs: { number: 7, sha256: '', source: 'system "A"\ncomponent H+ total 2 mmol/L\n', message: 'more acid', author: 'Bo', createdAt: '2026-12-01T10:00:00.000Z' },
  }

  it('marks the lines a line diff finds changed, even a line the other text also has elsewhere', () => {
    // Mine repeats a line theirs has once, and drops one: "found in the other text" would mark neither.
    const repeated = {
      mine: 'system "A"\ncomponent H+ total 2 mmol/L\nactivity ideal\ncomponent H+ total 2 mmol/L\n',
      theirs: { ...conflict.theirs, source: 'system "A"\ncomponent H+ total 2 mmol/L\nactivity ideal\n# rinse tank\n' },
    }
    wrapper = mount(WorkbenchConflict, { props: { conflict: repeated } })
    const marked = (side: string) => wrapper!.find(`[data-test=conflict-${side}]`).findAll('.bg-accent-soft').map((l) => l.text())
    expect(marked('mine')).toEqual(['4component H+ total 2 mmol/L'])
    expect(marked('theirs')).toEqual(['4# rinse tank'])
  })

  it('shows both texts with the lines found in only one of them marked', () => {
    wrapper = mount(WorkbenchConflict, { props: { conflict }, attachTo: document.body })
    expect(document.activeElement).toBe(wrapper.find('[data-test=save-conflict]').element)
    const marked = (side: string) => wrapper!.find(`[data-test=conflict-${side}]`).findAll('.bg-accent-soft').map((l) => l.text())
    expect(marked('mine')).toEqual(['2component Cl- total 5 mmol/L'])
    expect(marked('theirs')).toEqual(['2component H+ total 2 mmol/L'])
    expect(wrapper.text()).toContain('Bo saved revision 7')
    expect(wrapper.text()).toContain('“more acid”')
  })

  it('saves mine as the next revision, or takes theirs, only on a click', async () => {
    wrapper = mount(WorkbenchConflict, { props: { conflict } })
    expect(wrapper.emitted()).not.toHaveProperty('keepMine')
    expect(wrapper.find('[data-test=conflict-keep-mine]').text()).toBe('Save mine as revision 8')
    await wrapper.find('[data-test=conflict-keep-mine]').trigger('click')
    await wrapper.find('[data-test=conflict-take-theirs]').trigger('click')
    expect(wrapper.emitted('keepMine')).toHaveLength(1)
    expect(wrapper.emitted('takeTheirs')).toHaveLength(1)
  })
})

describe('WorkbenchExamplePicker', () => {
  it('offers a blank system first, then each example, and reports the choice', async () => {
    const examples = [{ slug: 'copper-rinse-tank', title: 'Rinse tank', summary: 'Copper after an etch.' }]
    wrapper = mount(WorkbenchExamplePicker, { props: { examples, modelValue: '' } })
    const radios = wrapper.findAll('input[type=radio]')
    expect(radios).toHaveLength(2)
    expect((radios[0]!.element as HTMLInputElement).checked).toBe(true)
    expect(wrapper.text()).toContain('Copper after an etch.')
    await radios[1]!.setValue(true)
    expect(wrapper.emitted('update:modelValue')!.at(-1)).toEqual(['copper-rinse-tank'])
  })
})
