import { afterEach, describe, expect, it, vi } from 'vitest'
import { mount } from '@vue/test-utils'
import ResultsExportMenu from '../../../components/results/ResultsExportMenu.vue'
import { carbonateSweep, copperAmmoniaResult } from '../../unit/results/fixtures'
import { parseCsv } from '../../unit/results/csvParse'

// Demo fixtures. Captures what the browser would save instead of saving it.
function captureDownloads() {
  const files: { name: string; blob: Blob }[] = []
  const blobs = new Map<string, Blob>()
  vi.spyOn(URL, 'createObjectURL').mockImplementation((blob) => {
    const url = `blob:demo/${blobs.size}`
    blobs.set(url, blob as Blob)
    return url
  })
  vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => {})
  vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
    files.push({ name: this.download, blob: blobs.get(this.href)! })
  })
  return files
}

afterEach(() => vi.restoreAllMocks())

describe('ResultsExportMenu', () => {
  it('downloads the sweep as CSV named from the prop, one row a point', async () => {
    const files = captureDownloads()
    const sweep = carbonateSweep()
    const wrapper = mount(ResultsExportMenu, { props: { sweep, fileName: 'limestone bed / rev 3' } })
    await wrapper.find('[data-test="export-csv"]').trigger('click')
    expect(files).toHaveLength(1)
    expect(files[0].name).toBe('limestone-bed-rev-3.csv')
    const text = (await files[0].blob.text()).replace(/^\uFEFF/, '')
    expect(parseCsv(text)).toHaveLength(sweep.values.length + 1)
  })

  it('downloads a single result as JSON, unchanged', async () => {
    const files = captureDownloads()
    const result = copperAmmoniaResult()
    const wrapper = mount(ResultsExportMenu, { props: { result, fileName: 'rinse-tank' } })
    await wrapper.find('[data-test="export-json"]').trigger('click')
    expect(files[0].name).toBe('rinse-tank.json')
    expect(JSON.parse(await files[0].blob.text())).toEqual(result)
  })

  it('offers nothing to download before a run', () => {
    const wrapper = mount(ResultsExportMenu, { props: { fileName: 'x' } })
    expect(wrapper.find('[data-test="export-csv"]').attributes('disabled')).toBeDefined()
    expect(wrapper.find('[data-test="export-json"]').attributes('disabled')).toBeDefined()
  })
})
