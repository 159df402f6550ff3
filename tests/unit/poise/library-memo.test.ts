// Libraries are compiled once per text: editing the file that uses them (the
// checker compiles it at every keystroke) does not compile them again, and a
// new revision of a library — or of a library it uses — does.
import { describe, expect, it } from 'vitest'
import { compile, type CompileOptions } from '../../../shared/poise/index'
import { libraryMemoStats } from '../../../shared/poise/compile'

// "acids" defines HF and uses "fluoride" (a library of sources only, revised in the tests).
const fluoride = (note: string) => `system "Fluoride"\ncomponent H+ balance\nsource hf "${note}"\n`
const acids = (pKa: number) => `system "Acids"\ncomponent H+ balance\ncomponent F- total 1 mM\nuse "fluoride"\nreaction HF <=> F- + H+ pKa ${pKa} cite "hf (demo)"\n`
const file = (extra = '') => `system "Rinse ${extra}"\ncomponent H+ balance\ncomponent F- total 2 mM\nuse "acids"\n`

/** A lab with the given revisions of each library (latest last). */
function lab(store: Record<string, string[]>): NonNullable<CompileOptions['resolveLibrary']> {
  return (name, revision) => {
    const all = store[name]
    if (!all) return null
    const number = revision ?? all.length
    return all[number - 1] === undefined ? null : { source: all[number - 1]!, revision: number }
  }
}

const logKOf = (source: string, resolveLibrary: CompileOptions['resolveLibrary'], species: string) =>
  compile(source, { resolveLibrary }).model!.reactions.find(r => r.defines === species)!.logK

describe('libraries compiled once per text', () => {
  it('does not compile the libraries again while only the file changes, and gives the same model', () => {
    const resolveLibrary = lab({ fluoride: [fluoride('first')], acids: [acids(3.17)] })
    const first = compile(file('a'), { resolveLibrary })
    const before = libraryMemoStats()
    const again = compile(file('a'), { resolveLibrary })
    const edited = compile(file('ab'), { resolveLibrary })
    const after = libraryMemoStats()
    expect(after.compiles).toBe(before.compiles)
    expect(after.hits).toBeGreaterThanOrEqual(before.hits + 2)
    expect(again).toEqual(first)
    expect(edited.model!.title).toBe('Rinse ab')
    expect(edited.model!.reactions).toEqual(first.model!.reactions)
    expect(first.model!.libraries).toEqual([{ name: 'acids', revision: 1 }, { name: 'fluoride', revision: 1 }])
  })

  it('compiles a library again when a library it uses gains a revision', () => {
    const one = lab({ fluoride: [fluoride('first')], acids: [acids(3.17)] })
    const two = lab({ fluoride: [fluoride('first'), fluoride('second')], acids: [acids(3.17)] })
    expect(compile(file('c'), { resolveLibrary: one }).model!.sources.hf).toBe('first')
    const before = libraryMemoStats()
    expect(compile(file('c'), { resolveLibrary: two }).model!.sources.hf).toBe('second')
    expect(libraryMemoStats().compiles).toBeGreaterThan(before.compiles)
    expect(compile(file('c'), { resolveLibrary: two }).model!.libraries).toEqual([{ name: 'acids', revision: 1 }, { name: 'fluoride', revision: 2 }])
    // And back: the first lab's answer is still its own.
    expect(compile(file('c'), { resolveLibrary: one }).model!.sources.hf).toBe('first')
  })

  it('compiles a library again when its own text changes, and reports its errors', () => {
    expect(logKOf(file('d'), lab({ fluoride: [fluoride('first')], acids: [acids(3.17)] }), 'HF')).toBe(-3.17)
    expect(logKOf(file('d'), lab({ fluoride: [fluoride('first')], acids: [acids(3.2)] }), 'HF')).toBe(-3.2)
    const broken = compile(file('d'), { resolveLibrary: lab({ fluoride: [fluoride('first')], acids: [acids(3.2).replace('HF <=> F- + H+', 'HF <=> F-')] }) })
    expect(broken.model).toBeNull()
    expect(broken.diagnostics).toContainEqual(expect.objectContaining({ code: 'P072', message: expect.stringMatching(/library "acids" has \d+ errors?; first, line 5/) }))
  })
})
