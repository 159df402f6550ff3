// @vitest-environment node
// The workbench page renders on the server first: these components must
// render there without a DOM (Plot is loaded in the browser only).
import { describe, expect, it } from 'vitest'
import { createSSRApp, h } from 'vue'
import { renderToString } from 'vue/server-renderer'
import ResultsDiagram from '../../../components/results/ResultsDiagram.vue'
import ResultsSpeciesTable from '../../../components/results/ResultsSpeciesTable.vue'
import { carbonate, carbonateAt, carbonateSweep, stoichiometry } from '../../unit/results/fixtures'

const model = stoichiometry(carbonate)

describe('server rendering', () => {
  it('renders the diagram controls without a DOM, leaving the drawing to the browser', async () => {
    const html = await renderToString(
      createSSRApp({ render: () => h(ResultsDiagram, { sweep: carbonateSweep(), model, systemKey: 'demo/carbonate' }) }),
    )
    expect(html).toContain('Log concentration')
    expect(html).not.toContain('<svg class="plot')
  })

  it('renders the species table rows on the server', async () => {
    const html = await renderToString(createSSRApp({ render: () => h(ResultsSpeciesTable, { result: carbonateAt(8, 2e-3), model }) }))
    expect(html).toContain('HCO₃⁻')
    expect(html).toContain('aria-sort="none"')
  })
})
