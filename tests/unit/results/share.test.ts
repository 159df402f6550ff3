import { describe, expect, it } from 'vitest'
import { dissolvedTotal, distributableComponents, speciesShares } from '../../../shared/results/share'
import {
  carbonate,
  carbonateAt,
  copperAmmonia,
  copperAmmoniaResult,
  PKA1_CARBONATE,
  PKA2_CARBONATE,
  stoichiometry,
} from './fixtures'

describe('speciesShares', () => {
  it('matches the closed-form fractions of a diprotic acid', () => {
    // Closed form of the fractions of a diprotic acid H2A (any analytical chemistry text):
    // alpha0 = h²/D, alpha1 = K1 h/D, alpha2 = K1 K2/D with D = h² + K1 h + K1 K2.
    const pH = 7.5
    const h = 10 ** -pH
    const k1 = 10 ** -PKA1_CARBONATE
    const k2 = 10 ** -PKA2_CARBONATE
    const d = h * h + k1 * h + k1 * k2
    const result = carbonateAt(pH, 2e-3)
    const shares = speciesShares(result, stoichiometry(carbonate), 'CO3^2-')
    const byName = Object.fromEntries(result.species.map((s, i) => [s.name, shares[i]]))
    expect(byName['H2CO3']).toBeCloseTo((h * h) / d, 12)
    expect(byName['HCO3-']).toBeCloseTo((k1 * h) / d, 12)
    expect(byName['CO3^2-']).toBeCloseTo((k1 * k2) / d, 12)
    expect(byName['OH-']).toBe(0)
  })

  it('weights each species by how many of the component it holds', () => {
    const result = copperAmmoniaResult()
    const model = stoichiometry(copperAmmonia)
    const shares = speciesShares(result, model, 'NH3')
    const i = result.species.findIndex((s) => s.name === 'Cu(NH3)4^2+')
    const c = result.species[i].concentration
    expect(shares[i]).toBeCloseTo((4 * c) / dissolvedTotal(result, model, 'NH3'), 14)
    expect(shares.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12)
  })

  it('finds species by name, whatever order the result lists them in', () => {
    const result = copperAmmoniaResult()
    const reversed = { ...result, species: [...result.species].reverse() }
    const model = stoichiometry(copperAmmonia)
    const share = (r: typeof result) => speciesShares(r, model, 'Cu^2+')[r.species.findIndex((s) => s.name === 'CuNH3^2+')]
    expect(share(reversed)).toBe(share(result))
  })

  it('gives NaN, not a number, for an unknown component or nothing dissolved', () => {
    const result = copperAmmoniaResult()
    const model = stoichiometry(copperAmmonia)
    expect(speciesShares(result, model, 'Zn^2+').every(Number.isNaN)).toBe(true)
    const empty = { ...result, species: result.species.map((s) => ({ ...s, concentration: 0 })) }
    expect(speciesShares(empty, model, 'Cu^2+').every(Number.isNaN)).toBe(true)
  })
})

describe('distributableComponents', () => {
  it('offers the components every species holds zero or more of, not H+', () => {
    expect(distributableComponents(stoichiometry(copperAmmonia))).toEqual(['Cu^2+', 'NH3'])
  })
})
