// A fit's answer as the workbench shows it: value ± standard error written
// as a person writes them, "not determined" where the data say nothing, the
// correlation matrix with a correlation beyond 0.95 marked, the warnings,
// and for each column the fitted curve over the points and the residuals.
import { afterEach, describe, expect, it } from 'vitest'
import { mount, type VueWrapper } from '@vue/test-utils'
import DatasetsFitResult from '../../../components/datasets/DatasetsFitResult.vue'
import type { FitResult } from '../../../shared/types/fit'

let wrapper: VueWrapper | null = null
afterEach(() => { wrapper?.unmount(); wrapper = null })

const fit: FitResult = {
  converged: true, iterations: 5, points: 4, degreesOfFreedom: 2, residualStandardDeviation: 0.012345,
  constants: [
    { reaction: 'C4H5O4- <=> C4H4O4^2- + H+', kind: 'pKa', value: 6.20417, standardError: 0.01234, initial: 5.8, logK: -6.20417, logKStandardError: 0.01234, defines: 'C4H5O4-', line: 7 },
    { reaction: 'C4H6O4 <=> C4H5O4- + H+', kind: 'pKa', value: 3.9, standardError: null, initial: 4.3, logK: -3.9, logKStandardError: null, defines: 'C4H6O4', line: 8 },
  ],
  correlation: [[1, -0.97], [-0.97, 1]],
  warnings: ['pKa of C4H6O4 <=> C4H5O4- + H+ is not determined by these data.'],
  variable: { header: 'volume mL', values: [1, 2, 3, 4] },
  columns: [{ header: 'pH', weight: 1, measured: [4, 5, null, 7], fitted: [4.01, 4.99, 6, 7.02], residual: [0.01, -0.01, null, 0.02] }],
  curve: { values: [1, 2.5, 4], columns: [{ header: 'pH', values: [4, 5.5, 7] }] },
}

describe('DatasetsFitResult', () => {
  it('shows each constant with value ± standard error, or "not determined", and the summary', () => {
    wrapper = mount(DatasetsFitResult, { props: { fit } })
    expect(wrapper.find('[data-test=fit-summary]').text().replace(/\s+/g, ' ')).toBe('Converged after 5 iterations: 2 constants fitted to 4 measured values; s = 0.0123, 2 degrees of freedom.')
    const cells = wrapper.findAll('[data-test=fit-constants] tbody tr').map((tr) => tr.findAll('td').map((td) => td.text()))
    expect(cells).toEqual([
      ['C4H5O4- <=> C4H4O4^2- + H+', 'pKa', '6.204 ± 0.012', '5.8'],
      ['C4H6O4 <=> C4H5O4- + H+', 'pKa', '3.9 (not determined)', '4.3'],
    ])
  })
  it('marks a correlation beyond 0.95 and lists the warnings', () => {
    wrapper = mount(DatasetsFitResult, { props: { fit } })
    const marked = wrapper.findAll('[data-test=fit-correlation] td').filter((td) => td.classes().includes('text-caution')).map((td) => td.text())
    expect(marked).toEqual(['-0.970', '-0.970'])
    expect(wrapper.find('[data-test=fit-warnings]').text()).toContain('is not determined by these data')
  })
  it('draws the measured points over the fitted curve, and a residual for each measured value', () => {
    wrapper = mount(DatasetsFitResult, { props: { fit } })
    expect(wrapper.findAll('[data-test=fit-curve] circle')).toHaveLength(3)
    expect(wrapper.find('[data-test=fit-curve] path').attributes('d')).toMatch(/^M[\d.]+,[\d.]+L[\d.]+,[\d.]+L[\d.]+,[\d.]+$/)
    expect(wrapper.findAll('[data-test=fit-residuals] circle')).toHaveLength(3)
  })
})
