// The species cap: a system at the cap is solved, one species more is refused
// with a message that names the cap and says what to change.
import { describe, expect, it } from 'vitest'
import { modelLimitProblem } from '../../../server/utils/solve-limits'
import { SIZE_LIMITS } from '../../../shared/poise/limits'
import type { Model } from '../../../shared/poise/model'
import { compile } from '../../../shared/poise/index'
import { scalingSystemSource } from '../../../bench/scaling'

const MAX_SPECIES = SIZE_LIMITS.maxSpecies

/** A model with n species (only the counts matter to the limits). */
const withSpecies = (n: number) => ({ species: Array.from({ length: n }, (_, i) => ({ name: `S${i}` })), solids: [], sweep: null, titration: null }) as unknown as Model

describe('the species cap', () => {
  it('accepts a system at the cap and refuses one species more, saying what to change', () => {
    expect(modelLimitProblem(withSpecies(MAX_SPECIES))).toBeNull()
    expect(modelLimitProblem(withSpecies(MAX_SPECIES + 1))).toBe(`The system has ${MAX_SPECIES + 1} species; at most ${MAX_SPECIES} are allowed. Split it into smaller systems.`)
  })

  it('lets the largest system of the scaling benchmark (256 components, 765 species) through', () => {
    const model = compile(scalingSystemSource(256, 2)).model!
    expect(model.species.length).toBe(765)
    expect(modelLimitProblem(model)).toBeNull()
  })
})
