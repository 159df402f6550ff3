// Which run and which revision's text the printable report shows.
import { describe, expect, it, vi } from 'vitest'
import { loadReport, reportChoice } from '../../../utils/reportData'
import type { RunView } from '../../../shared/types/system'
import { revisionFixture, runFixture } from '../../fixtures/answers'

// Demo systems (invented numbers).
const text = (n: number, extra = '') => `system "Rinse tank"\n${extra}component H+ total ${n} mmol/L\n`
const revision = (number: number, source = text(number)) => revisionFixture(number, source)
const run = (id: number, rev: number, libraries: RunView['libraries'] = []) => runFixture(id, { revision: rev, libraries })
const base = '/api/labs/demo/systems/rinse'
/** A fake API: runs 9 (revision 3) and 7, 5 (revision 2, newest first); revisions 1–3. */
function api(routes: Record<string, unknown> = {}) {
  const answers: Record<string, unknown> = {
    [`${base}/runs`]: { runs: [run(9, 3), run(7, 2), run(5, 2)] },
    [`${base}/runs/9`]: { ...run(9, 3), result: {} },
    [`${base}/runs/7`]: { ...run(7, 2), result: {} },
    [`${base}/runs/5`]: { ...run(5, 2), result: {} },
    [`${base}/revisions/2`]: { revision: revision(2) },
    [`${base}/revisions/1`]: { revision: revision(1) },
    ...routes,
  }
  return vi.fn(async (url: string) => {
    if (url in answers) return answers[url]
    throw Object.assign(new Error('not found'), { statusCode: 404 })
  })
}

describe('reportChoice', () => {
  it('takes positive whole numbers only', () => {
    expect(reportChoice({ run: '9', revision: '2' })).toEqual({ run: 9, revision: 2 })
    expect(reportChoice({ run: '-1', revision: '2.5' })).toEqual({ run: null, revision: null })
    expect(reportChoice({})).toEqual({ run: null, revision: null })
  })
})

describe('loadReport', () => {
  const latest = revision(3)

  it('by default reports the newest run of the latest revision', async () => {
    const report = await loadReport(api() as never, 'demo', 'rinse', latest, { run: null, revision: null })
    expect(report).toMatchObject({ number: 3, revision: { number: 3 }, run: { id: 9 } })
  })

  it('for ?revision=N shows that revision’s text and its newest run, not an older run of it', async () => {
    const report = await loadReport(api() as never, 'demo', 'rinse', latest, { run: null, revision: 2 })
    expect(report.revision?.source).toBe(text(2))
    expect(report.run?.id).toBe(7)
  })

  it('for a revision without a run shows its text and no run; for one that does not exist, neither', async () => {
    expect(await loadReport(api() as never, 'demo', 'rinse', latest, { run: null, revision: 1 })).toMatchObject({ number: 1, revision: { number: 1 }, run: null })
    expect(await loadReport(api() as never, 'demo', 'rinse', latest, { run: null, revision: 8 })).toMatchObject({ number: 8, revision: null, run: null })
  })

  it('for ?run=ID shows the revision that run solved', async () => {
    const report = await loadReport(api() as never, 'demo', 'rinse', latest, { run: 5, revision: null })
    expect(report).toMatchObject({ number: 2, revision: { number: 2 }, run: { id: 5 } })
  })

  it('for a run that stored its model, fetches no library text: the stored model is printed', async () => {
    const uses = revision(2, text(2, 'use "water"\n'))
    const get = api({
      [`${base}/revisions/2`]: { revision: uses },
      [`${base}/runs/7`]: { ...run(7, 2, [{ name: 'water', revision: 1 }]), compilerVersion: '1.0.0', storedModel: true, model: { title: 'Rinse tank' }, result: {} },
    })
    const report = await loadReport(get as never, 'demo', 'rinse', latest, { run: null, revision: 2 })
    expect(report.run?.model).toEqual({ title: 'Rinse tank' })
    expect(report.libraries).toEqual({})
    expect(get.mock.calls.map((c) => c[0]).filter((u) => u.includes('/libraries'))).toEqual([])
  })

  it('for a run stored before models were, loads a used library at the revision the run was solved with, not today’s latest', async () => {
    const uses = revision(2, text(2, 'use "water"\n'))
    const get = api({
      [`${base}/revisions/2`]: { revision: uses },
      [`${base}/runs/7`]: { ...run(7, 2, [{ name: 'water', revision: 1 }]), result: {} },
      '/api/labs/demo/libraries': { libraries: [{ name: 'water', title: 'Water', latestRevision: 4 }] },
      '/api/labs/demo/libraries/water/revisions/1': { name: 'water', revision: 1, source: 'system "Water"\n' },
    })
    const report = await loadReport(get as never, 'demo', 'rinse', latest, { run: null, revision: 2 })
    expect(report.libraries['water@latest']).toEqual({ source: 'system "Water"\n', revision: 1 })
    expect(get).not.toHaveBeenCalledWith('/api/labs/demo/libraries/water/revisions/4')
  })
})
