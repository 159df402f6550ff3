// The stored runs of a system: the lab's storage in words, a run that
// predates stored models marked, and Delete only for those who may.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import RunsList from '../../../components/runs/RunsList.vue'
import type { RunView } from '../../../shared/types/system'
import { runFixture } from '../../fixtures/answers'

const stubs = { NuxtLink: { props: ['to'], template: '<a :href="to.path + \'?run=\' + to.query.run"><slot /></a>' } }
const run = (id: number, extra: Partial<RunView> = {}) =>
  runFixture(id, { revision: 2, kind: 'sweep', compilerVersion: '1.0.0', storedModel: true, storedBytes: 13_800_000, timingMs: 900, ...extra })
const storage = { usedBytes: 241_300_000, budgetBytes: 250_000_000 }

describe('RunsList', () => {
  it('says how much of the lab\'s budget runs use, and lets an editor delete a run', async () => {
    const wrapper = mount(RunsList, { props: { runs: [run(7), run(5, { compilerVersion: null, storedModel: false, storedBytes: 2_400 })], storage, canDelete: true, busy: false, reportPath: '/labs/l/systems/s/report' }, global: { stubs } })
    expect(wrapper.find('[data-test=run-storage]').text()).toBe('This lab\'s stored runs use 241 MB of its 250 MB run storage budget. Delete runs you no longer need to free space; the revisions stay.')
    const rows = wrapper.findAll('tbody tr')
    expect(rows[0]!.text()).toContain('solver 1.0.0, compiler 1.0.0')
    expect(rows[0]!.text()).toContain('13.8 MB')
    expect(rows[1]!.text()).toContain('stored before runs kept their model')
    expect(rows[1]!.text()).toContain('2.4 KB')
    expect(rows[0]!.find('a').attributes('href')).toBe('/labs/l/systems/s/report?run=7')
    await wrapper.find('[data-test=delete-run-5]').trigger('click')
    expect(wrapper.emitted('delete')).toEqual([[expect.objectContaining({ id: 5 })]])
  })

  it('offers a viewer no Delete, and says who can free space', () => {
    const wrapper = mount(RunsList, { props: { runs: [run(7)], storage, canDelete: false, busy: false, reportPath: '/r' }, global: { stubs } })
    expect(wrapper.find('[data-test=delete-run-7]').exists()).toBe(false)
    expect(wrapper.find('[data-test=run-storage]').text()).toMatch(/Editors and owners can delete old runs to free space\.$/)
  })
})
