// preloadLibraries: every library revision a text reaches is loaded once,
// before the (synchronous) compile, and the compiler sees exactly those.
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { preloadLibraries, type LibraryText } from '../../../shared/utils/library-preload'

const water = (pKw: number) => `system "Water"\ncomponent H+ balance\nreaction H2O <=> H+ + OH- pKw ${pKw} cite "water (from memory)"\n`
const acids = `system "Acids"\ncomponent H+ balance\ncomponent F- total 1 mM\nuse "water" @ 1\nreaction HF <=> F- + H+ pKa 3.17 cite "hf (from memory)"\n`

/** A library store with revisions 1 and 2 of "water" and 1 of "acids", counting each load. */
function store(extra: Record<string, string[]> = {}) {
  const revisions: Record<string, string[]> = { water: [water(14), water(13.99)], acids: [acids], ...extra }
  const loads: string[] = []
  const load = async (name: string, revision: number | null): Promise<LibraryText | null> => {
    loads.push(`${name}@${revision ?? 'latest'}`)
    const all = revisions[name]
    if (!all) return null
    const number = revision ?? all.length
    return all[number - 1] === undefined ? null : { source: all[number - 1]!, revision: number }
  }
  return { load, loads }
}

describe('preloadLibraries', () => {
  it('loads the libraries of libraries, each revision once, and records what the model used', async () => {
    const { load, loads } = store()
    const file = `system "Rinse"\ncomponent H+ balance\ncomponent F- total 2 mM\nuse "acids"\nuse "water"\n`
    const resolveLibrary = await preloadLibraries(file, load)
    expect(loads.sort()).toEqual(['acids@latest', 'water@1', 'water@latest'])
    const { model, diagnostics } = compile(file, { resolveLibrary })
    expect(diagnostics.filter((d) => d.severity === 'error')).toEqual([])
    expect(model!.libraries).toEqual(expect.arrayContaining([{ name: 'acids', revision: 1 }, { name: 'water', revision: 1 }, { name: 'water', revision: 2 }]))
  })

  it('lets the compiler name the latest revision when a pinned one does not exist', async () => {
    const { load } = store()
    const file = `system "Rinse"\ncomponent H+ balance\nuse "water" @ 5\n`
    const d = compile(file, { resolveLibrary: await preloadLibraries(file, load) }).diagnostics
    expect(d).toContainEqual(expect.objectContaining({ code: 'P071', message: expect.stringContaining('its latest is 2') }))
  })

  it('stops at a loop of libraries and leaves the compiler to report it', async () => {
    const loop = `system "Loop"\ncomponent H+ balance\nuse "loop"\n`
    const { load, loads } = store({ loop: [loop] })
    const resolveLibrary = await preloadLibraries(loop, load)
    expect(loads).toEqual(['loop@latest'])
    expect(compile(loop, { resolveLibrary }).diagnostics).toContainEqual(expect.objectContaining({ code: 'P072', message: expect.stringContaining('uses itself') }))
  })
})
