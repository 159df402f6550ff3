// The compile cache: an unchanged text (and unchanged libraries) gives the
// model of a fresh compile; a new library revision compiles afresh.
import { beforeEach, describe, expect, it } from 'vitest'
import { compile, type CompileOptions } from '../../../shared/poise/index'
import { clearCompileCache, compileCached } from '../../../server/utils/compile-cache'

const water = (pKw: number) => `system "Water"\ncomponent H+ balance\nreaction H2O <=> H+ + OH- pKw ${pKw} cite "water (demo)"\n`
const file = `system "Rinse"\ncomponent H+ balance\ncomponent Na+ total 1 mM\nuse "water"\n`

/** A resolver over a lab whose "water" library has the given revisions (latest last). */
function lab(revisions: string[]): NonNullable<CompileOptions['resolveLibrary']> {
  return (name, revision) => {
    if (name !== 'water') return null
    const number = revision ?? revisions.length
    const source = revisions[number - 1]
    return source === undefined ? null : { source, revision: number }
  }
}

const logKOfWater = (model: NonNullable<ReturnType<typeof compile>['model']>) =>
  model.reactions.find(r => r.defines === 'OH-')!.logK

beforeEach(() => clearCompileCache())

describe('compileCached', () => {
  it('returns the model and diagnostics of a fresh compile, the second time from the cache', () => {
    const resolveLibrary = lab([water(14)])
    const fresh = compile(file, { resolveLibrary })
    const first = compileCached(file, { resolveLibrary })
    const second = compileCached(file, { resolveLibrary })
    expect(first).toEqual(fresh)
    expect(second).toBe(first)
    expect(second.model!.libraries).toEqual([{ name: 'water', revision: 1 }])
  })

  it('compiles afresh when a library gains a revision, and gives its constants', () => {
    const before = compileCached(file, { resolveLibrary: lab([water(14)]) })
    const after = compileCached(file, { resolveLibrary: lab([water(14), water(13.5)]) })
    expect(after).not.toBe(before)
    expect(after).toEqual(compile(file, { resolveLibrary: lab([water(14), water(13.5)]) }))
    expect(after.model!.libraries).toEqual([{ name: 'water', revision: 2 }])
    expect(logKOfWater(before.model!)).toBe(-14)
    expect(logKOfWater(after.model!)).toBe(-13.5)
  })

  it('compiles afresh when a library revision is edited in place or removed', () => {
    const first = compileCached(file, { resolveLibrary: lab([water(14)]) })
    const edited = compileCached(file, { resolveLibrary: lab([water(13.9)]) })
    expect(edited).not.toBe(first)
    expect(edited).toEqual(compile(file, { resolveLibrary: lab([water(13.9)]) }))
    const gone = compileCached(file, { resolveLibrary: lab([]) })
    expect(gone.model).toBeNull()
    expect(gone.diagnostics.some(d => d.severity === 'error' && /water/.test(d.message))).toBe(true)
  })

  it('keys on the text: a changed text is compiled, not confused with the cached one', () => {
    const a = compileCached(water(14))
    const b = compileCached(water(12))
    expect(b).toEqual(compile(water(12)))
    expect(b).not.toEqual(a)
  })

  it('hands out a frozen answer, so no request can change the next one', () => {
    const model = compileCached(water(14)).model!
    expect(() => { (model.components as unknown[]).push({}) }).toThrow(TypeError)
    expect(compileCached(water(14)).model!.components).toHaveLength(1)
  })
})
