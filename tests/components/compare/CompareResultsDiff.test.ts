// Where each side of a compare comes from, in words: a stored run as it was
// solved, a run stored before models were, or a solve made for the compare
// and not stored.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import CompareResultsDiff from '../../../components/compare/CompareResultsDiff.vue'
import type { ResultsDiff } from '../../../shared/diff/results-diff'

const diff = { kind: 'single', sweep: null, pH: null, ionicStrength: null, species: [], solids: [], saturation: [], unconverged: [] } as unknown as ResultsDiff

describe('CompareResultsDiff', () => {
  it('names the stored run of one side and says the other was solved now and not stored', () => {
    const wrapper = mount(CompareResultsDiff, {
      props: {
        diff,
        fromNumber: 3,
        toNumber: 4,
        solved: {
          solverVersion: '1.0.0',
          from: { origin: 'stored', runId: 4012, runNumber: 12, solverVersion: '1.0.0', compilerVersion: '0.9.0', model: 'stored' },
          to: { origin: 'solved-now', runId: null, runNumber: null, solverVersion: '1.0.0', compilerVersion: '1.0.0', model: 'compiled-now' },
        },
      },
    })
    const lines = wrapper.findAll('[data-testid=compare-origins] li').map((li) => li.text())
    expect(lines).toEqual([
      'Revision 3: stored run 12, as it was solved (solver 1.0.0, compiler 0.9.0).',
      'Revision 4 has no stored run: solved now for this comparison (solver 1.0.0) and not stored.',
    ])
  })

  it('says when a stored run predates stored models', () => {
    const wrapper = mount(CompareResultsDiff, {
      props: {
        diff, fromNumber: 1, toNumber: 2,
        solved: {
          solverVersion: '1.0.0',
          from: { origin: 'stored', runId: 3004, runNumber: 4, solverVersion: '1.0.0', compilerVersion: null, model: 'compiled-now' },
          to: { origin: 'stored', runId: 3009, runNumber: 9, solverVersion: '1.0.0', compilerVersion: '1.0.0', model: 'stored' },
        },
      },
    })
    expect(wrapper.find('[data-testid=compare-origins]').text()).toContain('Revision 1: stored run 4 (solver 1.0.0), stored before models were; its model is today\'s compile of its text.')
  })
})
