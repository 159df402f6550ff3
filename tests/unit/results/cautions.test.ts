import { describe, expect, it } from 'vitest'
import {
  acidificationNotes,
  modelLimitsText,
  sweepToxicCautions,
  TOXIC_SHARE_THRESHOLD,
  toxicCautions,
} from '../../../shared/results/cautions'
import type { SweepResult } from '../../../shared/types/result'
import { carbonate, carbonateAt, copperAmmonia, solvedAt, stoichiometry, sulfide, sulfideAt } from './fixtures'

const sulfideModel = stoichiometry(sulfide)

describe('toxic volatile species', () => {
  it('warns when H2S is most of the dissolved sulfide (pH 6, below its pKa1 of about 7)', () => {
    const [caution, ...rest] = toxicCautions(sulfideAt(6), sulfideModel)
    expect(rest).toEqual([])
    expect(caution.species).toBe('H2S')
    expect(caution.component).toBe('HS-')
    expect(caution.gas).toBe('hydrogen sulfide')
    expect(caution.share).toBeGreaterThan(0.9)
    expect(caution.message).toContain('H₂S is 91 % of the dissolved sulfide')
    expect(caution.message).toMatch(/acidic/)
    expect(caution.message).toMatch(/local regulations/)
  })

  it('stays quiet when H2S is a small share (pH 9)', () => {
    expect(toxicCautions(sulfideAt(9), sulfideModel)).toEqual([])
  })

  it('switches on just above the threshold share and not just below it', () => {
    // share of H2S = 1 / (1 + 10^(pH - 7)); 10 % is reached at pH 7 + log10(9).
    const edge = 7 + Math.log10(1 / TOXIC_SHARE_THRESHOLD - 1)
    expect(toxicCautions(sulfideAt(edge - 0.01), sulfideModel)).toHaveLength(1)
    expect(toxicCautions(sulfideAt(edge + 0.01), sulfideModel)).toHaveLength(0)
  })

  it('warns about ammonia when free NH3 is a large share of the ammonia (alkaline rinse)', () => {
    const model = stoichiometry(copperAmmonia)
    const alkaline = solvedAt(copperAmmonia, [-10, -9, Math.log10(0.05)])
    const acid = solvedAt(copperAmmonia, [-7, -9, Math.log10(0.05)])
    expect(toxicCautions(alkaline, model).map((c) => c.gas)).toEqual(['ammonia'])
    expect(toxicCautions(acid, model)).toEqual([])
  })

  it('says nothing for a failed run or a system without volatile toxics', () => {
    expect(toxicCautions({ ...sulfideAt(6), converged: false }, sulfideModel)).toEqual([])
    expect(toxicCautions(carbonateAt(5, 1e-3), stoichiometry(carbonate))).toEqual([])
  })

  it('reports the worst point of a sweep, once a species', () => {
    const values = [5, 6, 7, 8, 9, 10]
    const sweep: SweepResult = { variable: 'pH', component: null, values, points: values.map(sulfideAt) }
    const cautions = sweepToxicCautions(sweep, sulfideModel)
    expect(cautions).toHaveLength(1)
    expect(cautions[0].at).toBe(5)
    expect(cautions[0].message).toContain('at pH 5')
  })
})

describe('standing notes and footer', () => {
  it('notes that acidifying a sulfide system releases H2S, unless a warning already says it', () => {
    expect(acidificationNotes(sulfideModel)).toHaveLength(1)
    expect(acidificationNotes(sulfideModel)[0]).toMatch(/hydrogen sulfide/)
    expect(acidificationNotes(sulfideModel, ['H2S'])).toEqual([])
    expect(acidificationNotes(stoichiometry(copperAmmonia))).toEqual([])
  })

  it('states the model limits and defers to measurement and regulations', () => {
    const text = modelLimitsText('davies')
    expect(text).toMatch(/constants/)
    expect(text).toMatch(/equilibrium/)
    expect(text).toMatch(/Davies/)
    expect(text).toMatch(/local regulations/)
    expect(modelLimitsText()).not.toMatch(/Davies/)
  })
})
