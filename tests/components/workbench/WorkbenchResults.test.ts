// The results pane reads the workbench store: it labels a preview as not
// stored, offers the printable report only for a stored run, and for a sweep
// shows the chosen point in the tables and shares out the main component.
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { mount } from '@vue/test-utils'
import { nextTick } from 'vue'
import { createPinia, setActivePinia } from 'pinia'
import WorkbenchResults from '../../../components/workbench/WorkbenchResults.vue'
import { useWorkbenchStore } from '../../../stores/workbench'
import { revisionFixture, systemFixture } from '../../fixtures/answers'
import type { Result, SweepResult } from '../../../shared/types/result'

// Demo system and numbers (invented).
const source = `system "Buffer"
activity ideal
component H+ balance
component Na+ total 150 mmol/L
component H2PO4- total 100 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
reaction H2PO4- <=> HPO4^2- + H+ pKa 7.20 cite "from memory"
`
const answer = systemFixture(revisionFixture(2, source), 'editor', { slug: 'buffer', title: 'Buffer' }, { slug: 'demo', name: 'Demo' })
const point = (pH: number): Result => ({
  converged: true, iterations: 3, temperatureC: 25, pH, ionicStrength: 0.2, components: [], solids: [], residuals: { maxScaled: 1e-12 },
  species: [
    { name: 'H2PO4-', charge: -1, concentration: 0.05, log10: Math.log10(0.05), activity: 0.05, gamma: 1 },
    { name: 'HPO4^2-', charge: -2, concentration: 0.05, log10: Math.log10(0.05), activity: 0.05, gamma: 1 },
  ],
})

const stubs = { NuxtLink: { props: ['to'], template: '<a :href="to" data-test="report-link"><slot /></a>' }, ResultsDiagram: true }
let fetcher: ReturnType<typeof vi.fn>

beforeEach(() => {
  setActivePinia(createPinia())
  fetcher = vi.fn()
  vi.stubGlobal('$fetch', fetcher)
  window.localStorage.clear()
})

describe('WorkbenchResults', () => {
  it('asks for a run before there is one', () => {
    useWorkbenchStore().open(answer)
    const wrapper = mount(WorkbenchResults, { global: { stubs } })
    expect(wrapper.find('[data-test=no-run]').text()).toMatch(/Press Run/)
    expect(wrapper.find('[data-test=export-csv]').exists()).toBe(false)
  })

  it('labels a preview as not stored and offers no report for it', async () => {
    const store = useWorkbenchStore()
    store.open(answer)
    store.source = source + '# edited\n'
    fetcher.mockResolvedValueOnce({ kind: 'single', solverVersion: '1.0.0', elapsedMs: 3, diagnostics: [], result: point(7.2) })
    await store.run()
    const wrapper = mount(WorkbenchResults, { global: { stubs } })
    expect(wrapper.find('[data-test=preview-label]').text()).toMatch(/Preview of unsaved text — not stored/)
    await wrapper.find('[data-test=tab-report]').trigger('click')
    expect(wrapper.find('[data-test=report-link]').exists()).toBe(false)
    expect(wrapper.find('[data-test=report-tab]').text()).toMatch(/made from a stored run/)
    expect(wrapper.find('[data-test=constants]').text()).toContain('H2PO4- <=> HPO4^2- + H+')
  })

  it('shows the chosen sweep point, links the report to it, and shares out the phosphate', async () => {
    const store = useWorkbenchStore()
    store.open(answer)
    const sweep: SweepResult = { variable: 'pH', component: null, values: [6.2, 7.2, 8.2], points: [point(6.2), point(7.2), point(8.2)] }
    fetcher.mockResolvedValueOnce({ id: 31, revision: 2, status: 'ok', kind: 'sweep', solverVersion: '1.0.0', timingMs: 9, createdAt: '2026-12-01T10:05:00.000Z', createdBy: 'Ann', failedPoints: 0, result: sweep })
    await store.run()
    const wrapper = mount(WorkbenchResults, { global: { stubs } })
    await wrapper.find('[data-test=sweep-point]').setValue('1')
    expect(wrapper.find('[data-test=summary-ph]').text()).toBe('7.200')
    expect((wrapper.find('[data-test=share-component]').element as HTMLSelectElement).value).toBe('H2PO4-')
    await wrapper.find('[data-test=tab-report]').trigger('click')
    await nextTick()
    expect(wrapper.find('[data-test=report-link]').attributes('href')).toBe('/labs/demo/systems/buffer/report?run=31&point=1')
  })

  it('starts from the component the diagram remembers for this system', async () => {
    window.localStorage.setItem('equipoise:diagram:demo/buffer', JSON.stringify({ kind: 'distribution', component: 'Na+' }))
    const store = useWorkbenchStore()
    store.open(answer)
    fetcher.mockResolvedValueOnce({ id: 32, revision: 2, status: 'ok', kind: 'single', solverVersion: '1.0.0', timingMs: 9, createdAt: '2026-12-01T10:05:00.000Z', createdBy: 'Ann', failedPoints: 0, result: point(7.2) })
    await store.run()
    const wrapper = mount(WorkbenchResults, { global: { stubs } })
    expect((wrapper.find('[data-test=share-component]').element as HTMLSelectElement).value).toBe('Na+')
  })
})
