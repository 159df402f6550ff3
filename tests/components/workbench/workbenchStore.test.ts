// The workbench store: which kind of run a click makes, what a refused run
// or save leaves on screen, and that a save conflict never overwrites.
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { compile } from '../../../shared/poise/index'
import { PREVIEW_ACCEPT, problemFrom, runPlan, useWorkbenchStore } from '../../../stores/workbench'
import { latestRunOf, richestComponent } from '../../../utils/picks'
import type { SystemAnswer } from '../../../shared/types/system'
import { revisionFixture, runFixture, systemFixture } from '../../fixtures/answers'
import { sweep as solveSweep } from '../../../server/solver/index'
import { encodeBinaryAnswer } from '../../../shared/results/binary-answer'
import { toSweepColumns } from '../../../shared/results/sweep-columns'

// Demo system (invented numbers).
const saved = `system "Strike bath"
activity ideal
component H+ total 1 mmol/L
component Cl- total 1 mmol/L
reaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"
`

function answer(role: SystemAnswer['role'] = 'editor', number = 4, source = saved): SystemAnswer {
  return systemFixture(revisionFixture(number, source), role)
}

const result = { converged: true, iterations: 3, temperatureC: 25, pH: 3, ionicStrength: 1e-3, species: [], solids: [], components: [], residuals: { maxScaled: 0 } }
const run = (id: number, revision: number, withResult = true) => runFixture(id, { revision, ...(withResult ? { result } : {}) })
/** The model a run stored: today's compile of `saved` with pKw moved, as if compiled by an older compiler. */
function storedModel() {
  const model = structuredClone(compile(saved).model!)
  model.title = 'Strike bath (as solved)'
  model.reactions[0]!.value = 13.99
  return model
}

/** An error shaped like ofetch's FetchError for an h3 createError answer. */
function refusal(statusCode: number, message: string, data?: unknown) {
  return Object.assign(new Error(message), { statusCode, data: { statusCode, message, data } })
}

let fetcher: ReturnType<typeof vi.fn>
beforeEach(() => {
  setActivePinia(createPinia())
  fetcher = vi.fn()
  vi.stubGlobal('$fetch', fetcher)
})

describe('runPlan', () => {
  it('stores runs of unchanged text, previews unsaved edits, and only previews for a viewer', () => {
    // runPlan(canStore, canEdit, dirty)
    expect(runPlan(true, true, false)).toBe('stored')
    expect(runPlan(true, true, true)).toBe('preview')
    expect(runPlan(true, false, false)).toBe('stored') // a reviewer
    expect(runPlan(false, false, false)).toBe('preview') // a viewer
  })
})

describe('problemFrom', () => {
  it('keeps the server’s message and diagnostics, and words a lost connection', () => {
    const diagnostics = [{ severity: 'error', code: 'P020', message: 'does not balance', range: { from: 0, to: 1, line: 5, column: 1, endLine: 5, endColumn: 2 } }]
    expect(problemFrom(refusal(422, 'fix it', { diagnostics }))).toEqual({ status: 422, message: 'fix it', diagnostics })
    expect(problemFrom(new TypeError('fetch failed'))).toMatchObject({ status: 0, message: expect.stringMatching(/could not be reached/) })
  })
})

describe('latestRunOf', () => {
  it('takes the newest run of the given revision only', () => {
    expect(latestRunOf([run(9, 3), run(8, 4), run(7, 4)], 4)?.id).toBe(8)
    expect(latestRunOf([run(9, 3)], 4)).toBeNull()
  })
})

describe('useWorkbenchStore', () => {
  it('runs unchanged text as a stored run of the saved revision', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    fetcher.mockResolvedValueOnce(run(12, 4))
    await store.run()
    expect(fetcher).toHaveBeenCalledWith('/api/labs/plating/systems/strike/runs', { method: 'POST', body: { revision: 4 } })
    expect(store.shown).toMatchObject({ origin: 'stored', solverMs: 4 })
    expect(store.shownModel?.title).toBe('Strike bath')
  })

  it('shows a stored run with the model it stored, not a recompile of its text', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    fetcher.mockResolvedValueOnce({ ...run(12, 4), compilerVersion: '0.9.0', storedModel: true, model: storedModel() })
    await store.run()
    expect(store.shownModel?.title).toBe('Strike bath (as solved)')
    expect(store.shownModel?.reactions[0]?.value).toBe(13.99)
    expect(store.shownModelRecompiled).toBe(false)
    expect(store.shown?.compilerVersion).toBe('0.9.0')
    // No library texts were fetched to rebuild the model.
    expect(fetcher).toHaveBeenCalledTimes(1)
  })

  it('says when a run predates stored models and falls back to a recompile of its text', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    fetcher.mockResolvedValueOnce({ ...run(12, 4), model: null })
    await store.run()
    expect(store.shownModelRecompiled).toBe(true)
    expect(store.shownModel?.reactions[0]?.value).toBe(14)
  })

  it('gives a viewer a preview of the saved revision that stores nothing', async () => {
    const store = useWorkbenchStore()
    store.open(answer('viewer'))
    expect(store.plan).toBe('preview')
    fetcher.mockResolvedValueOnce({ kind: 'single', solverVersion: '1.0.0', compilerVersion: '1.0.0', model: storedModel(), elapsedMs: 2.5, diagnostics: [], result })
    await store.run()
    expect(fetcher).toHaveBeenCalledWith('/api/labs/plating/solve', { method: 'POST', body: { source: saved }, headers: { accept: PREVIEW_ACCEPT } })
    expect(store.shown).toMatchObject({ origin: 'preview', ofRevision: 4 })
    expect(store.shownModel?.title).toBe('Strike bath (as solved)')
  })

  it('reads a sweep answered by columns, and makes the picked point from them', async () => {
    const store = useWorkbenchStore()
    store.open(answer('viewer'))
    const model = compile(`${saved}sweep pH from 3 to 9 points 25\n`).model!
    const solved = solveSweep(model)
    const bytes = encodeBinaryAnswer({ kind: 'sweep', solverVersion: '1.1.0', compilerVersion: '1.0.0', model, elapsedMs: 3, diagnostics: [], result: toSweepColumns(solved) })
    // $fetch gives a Blob for a media type it does not parse.
    fetcher.mockResolvedValueOnce(new Blob([bytes]))
    await store.run()
    expect(store.shown?.columns?.templateOf).toHaveLength(25)
    expect(store.sweep?.points).toHaveLength(25)
    store.pointIndex = 11
    expect(store.pointResult).toStrictEqual(JSON.parse(JSON.stringify(solved.points[11])))
    expect(JSON.stringify(store.sweep)).toBe(JSON.stringify(solved))
    expect(store.runProblem).toBeNull()
  })

  it('says to reload when the binary answer is not a sweep by columns', async () => {
    const store = useWorkbenchStore()
    store.open(answer('viewer'))
    fetcher.mockResolvedValueOnce(new Blob([encodeBinaryAnswer({ kind: 'sweep', result: { format: 'something else' } })]))
    await store.run()
    expect(store.shown).toBeNull()
    expect(store.runProblem?.message).toMatch(/Reload the page/)
  })

  it('lets a reviewer store runs of the saved revision', () => {
    const store = useWorkbenchStore()
    store.open(answer('reviewer'))
    expect(store.plan).toBe('stored')
  })

  it('solves unsaved edits as a preview of exactly the edited text', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    store.source = saved.replace('1 mmol/L\ncomponent Cl-', '2 mmol/L\ncomponent Cl-')
    fetcher.mockResolvedValueOnce({ kind: 'single', solverVersion: '1.0.0', elapsedMs: 2.5, diagnostics: [], result })
    await store.run()
    // The lab's solve route, so a `use "library"` in the draft resolves.
    expect(fetcher).toHaveBeenCalledWith('/api/labs/plating/solve', { method: 'POST', body: { source: store.source }, headers: { accept: PREVIEW_ACCEPT } })
    expect(store.shown).toMatchObject({ origin: 'preview', ofRevision: null })
    expect(store.shownIsStale).toBe(false)
    store.source += '# a note\n'
    expect(store.shownIsStale).toBe(true)
  })

  it('loads the libraries the text uses, so the browser’s compiler finds them and names the missing ones', async () => {
    const library = `system "Water library"\ncomponent H+ total 1 mmol/L\nreaction H2O <=> H+ + OH- pKw 14.00 cite "from memory"\n`
    const uses = `system "Strike bath"\nuse "water"\nuse "ghost"\nactivity ideal\ncomponent H+ total 1 mmol/L\ncomponent Cl- total 1 mmol/L\n`
    const store = useWorkbenchStore()
    store.open(answer('editor', 4, uses))
    fetcher.mockImplementation(async (url: string) => {
      if (url === '/api/labs/plating/libraries') return { libraries: [{ name: 'water', title: 'Water library', latestRevision: 2 }] }
      if (url === '/api/labs/plating/libraries/water/revisions/2') return { name: 'water', revision: 2, source: library }
      throw refusal(404, 'no such library')
    })
    await store.loadLibraries()
    const codes = compile(store.source, { resolveLibrary: store.resolveLibrary }).diagnostics.map((d) => `${d.code} ${d.message}`)
    expect(codes.filter((c) => c.includes('"water"'))).toEqual([])
    expect(codes).toContainEqual(expect.stringMatching(/^P070 there is no library "ghost"/))

    // A revision's text is fetched once; asking again only re-reads which revision is the latest.
    fetcher.mockClear()
    store.source = store.source.replace('use "ghost"\n', '')
    await store.loadLibraries()
    expect(fetcher.mock.calls.map((c) => c[0])).toEqual(['/api/labs/plating/libraries'])
    expect(compile(store.source, { resolveLibrary: store.resolveLibrary }).diagnostics.filter((d) => d.severity === 'error')).toEqual([])
  })

  it('shows a run stored before models were with the library revision it was solved with, not the library’s latest', async () => {
    // Acetic acid pKa 4.76 (from memory) in revision 1; revision 2 of the library moved it (demo).
    const library = (pKa: number) => `system "Acids"\ncomponent H+ balance\ncomponent CH3COO- total 10 mM\nreaction CH3COOH <=> CH3COO- + H+ pKa ${pKa} cite "acetic acid (from memory)"\n`
    const uses = `system "Vinegar rinse"\nuse "acids"\ncomponent H+ balance\ncomponent CH3COO- total 10 mM\n`
    const store = useWorkbenchStore()
    store.open(answer('editor', 4, uses))
    fetcher.mockImplementation(async (url: string) => {
      if (url === '/api/labs/plating/libraries') return { libraries: [{ name: 'acids', title: 'Acids', latestRevision: 2 }] }
      if (url === '/api/labs/plating/libraries/acids/revisions/1') return { name: 'acids', revision: 1, source: library(4.76) }
      if (url === '/api/labs/plating/libraries/acids/revisions/2') return { name: 'acids', revision: 2, source: library(5.5) }
      if (url === '/api/labs/plating/systems/strike/runs') return { ...run(12, 4), libraries: [{ name: 'acids', revision: 1 }] }
      throw refusal(404, 'not found')
    })
    await store.loadLibraries()
    await store.run()
    const pKa = () => store.shownModel?.reactions.find((r) => r.equation.includes('CH3COOH'))?.value
    await vi.waitFor(() => expect(pKa()).toBe(4.76))
    // The editor still checks against the latest.
    expect(compile(store.source, { resolveLibrary: store.resolveLibrary }).model?.reactions[0]?.value).toBe(5.5)
  })

  it('keeps the libraries it had when loading them fails', async () => {
    const store = useWorkbenchStore()
    store.open(answer('editor', 4, `system "Strike bath"\nuse "water"\ncomponent H+ total 1 mmol/L\n`))
    fetcher.mockRejectedValue(new TypeError('fetch failed'))
    await store.loadLibraries()
    expect(store.resolveLibrary).toBeUndefined()
  })

  it('keeps a refused run’s diagnostics for the page to show', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    const diagnostics = [{ severity: 'error', code: 'P020', message: 'does not balance', range: { from: 0, to: 1, line: 5, column: 1, endLine: 5, endColumn: 2 } }]
    fetcher.mockRejectedValueOnce(refusal(422, 'The system has 1 error', { diagnostics }))
    await store.run()
    expect(store.runProblem).toEqual({ status: 422, message: 'The system has 1 error', diagnostics })
    expect(store.shown).toBeNull()
    expect(store.running).toBe(false)
  })

  it('loads the newest run of the latest revision on opening, and otherwise shows a preview of the saved text at once, storing nothing', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    fetcher.mockResolvedValueOnce({ runs: [run(8, 4, false), run(7, 3, false)] }).mockResolvedValueOnce(run(8, 4))
    await store.loadLastRun()
    expect(fetcher).toHaveBeenLastCalledWith('/api/labs/plating/systems/strike/runs/8', undefined)
    expect(store.shown).toMatchObject({ origin: 'stored', run: { id: 8 } })

    setActivePinia(createPinia())
    const other = useWorkbenchStore()
    other.open(answer())
    other.source = saved + '# an edit not yet saved\n'
    fetcher.mockResolvedValueOnce({ runs: [run(7, 3, false)] })
      .mockResolvedValueOnce({ kind: 'single', solverVersion: '1.0.0', compilerVersion: '1.0.0', elapsedMs: 2, diagnostics: [], libraries: [], result, model: compile(saved).model })
    await other.loadLastRun()
    expect(other.olderRun?.revision).toBe(3)
    // The saved revision, not the edit, through the preview route that stores nothing.
    expect(fetcher).toHaveBeenLastCalledWith('/api/labs/plating/solve', { method: 'POST', body: { source: saved }, headers: { accept: PREVIEW_ACCEPT } })
    expect(fetcher.mock.calls.filter(([url, options]) => options?.method === 'POST' && String(url).endsWith('/runs'))).toEqual([])
    expect(other.shown).toMatchObject({ origin: 'preview', ofRevision: 4, reason: 'opened', source: saved })
  })

  it('on a 409 keeps my text and shows theirs, and saves mine on top only when asked', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    const mine = saved.replace('Cl- total 1', 'Cl- total 5')
    store.source = mine
    const theirs = answer('editor', 5, saved.replace('H+ total 1', 'H+ total 2'))
    fetcher.mockRejectedValueOnce(refusal(409, 'Revision 5 was saved after the revision 4 you edited')).mockResolvedValueOnce(theirs)
    expect(await store.save('my change')).toBeNull()
    expect(store.conflict).toEqual({ mine, theirs: theirs.system.latest })
    expect(store.source).toBe(mine)
    expect(store.latest?.number).toBe(4)

    fetcher.mockResolvedValueOnce({ system: { ...theirs.system, latest: { ...theirs.system.latest, number: 6, source: mine } } })
    expect(await store.keepMine('my change')).toBe(5)
    expect(fetcher).toHaveBeenLastCalledWith('/api/labs/plating/systems/strike', { method: 'PATCH', body: { source: mine, message: 'my change', baseRevision: 5 } })
    expect(store.conflict).toBeNull()
    expect(store.latest?.number).toBe(6)
    expect(store.dirty).toBe(false)
  })

  it('drops my text for theirs when I choose so', async () => {
    const store = useWorkbenchStore()
    store.open(answer())
    store.source = saved + '# mine\n'
    const theirs = answer('editor', 5, saved + '# theirs\n')
    fetcher.mockRejectedValueOnce(refusal(409, 'stale')).mockResolvedValueOnce(theirs)
    await store.save('')
    store.takeTheirs()
    expect(store.source).toBe(saved + '# theirs\n')
    expect(store.latest?.number).toBe(5)
    expect(store.dirty).toBe(false)
  })

  it('keeps other refusals of a save as a message, not a conflict', async () => {
    const store = useWorkbenchStore()
    store.open(answer('editor'))
    store.source = saved + '#\n'
    fetcher.mockRejectedValueOnce(refusal(403, 'You need the editor role'))
    await store.save('')
    expect(store.conflict).toBeNull()
    expect(store.saveProblem?.message).toBe('You need the editor role')
    expect(store.canEdit).toBe(true)
  })
})

describe('richestComponent', () => {
  it('shares out the component most species hold, not a counter-ion', () => {
    const model = {
      components: [{ name: 'H+' }, { name: 'Na+' }, { name: 'H2PO4-' }],
      species: [
        { name: 'H+', nu: [1, 0, 0] }, { name: 'Na+', nu: [0, 1, 0] }, { name: 'H2PO4-', nu: [0, 0, 1] },
        { name: 'OH-', nu: [-1, 0, 0] }, { name: 'H3PO4', nu: [1, 0, 1] }, { name: 'HPO4^2-', nu: [-1, 0, 1] },
      ],
    }
    expect(richestComponent(model)).toBe('H2PO4-')
    expect(richestComponent({ components: [{ name: 'H+' }], species: [{ name: 'OH-', nu: [-1] }] })).toBeNull()
  })
})
