/**
 * The solver against closed forms of published methods: each equilibrium
 * below has an exact algebraic solution, which the solver must reproduce to
 * near machine precision (ideal activities, so the algebra is exact).
 */
import { describe, expect, it } from 'vitest'
import { solve } from '../../../server/solver/index'
import { buildModel, hydroxide, species } from './modelBuilder'

const Kw = 1e-14

/** Largest real root of a cubic in [lo, hi] by bisection on the exact polynomial. */
function rootIn(f: (h: number) => number, lo: number, hi: number): number {
  for (let k = 0; k < 400; k++) {
    const mid = Math.sqrt(lo * hi)
    if (Math.sign(f(mid)) === Math.sign(f(lo))) lo = mid; else hi = mid
  }
  return Math.sqrt(lo * hi)
}

describe('weak acid and weak base, exact with water', () => {
  // Exact proton condition of a weak acid HA (total C) in water: charge balance
  // [H+] = [A-] + [OH-] with [A-] = C Ka/(Ka + [H+]) gives the cubic
  // h³ + Ka h² − (Kw + Ka C) h − Ka Kw = 0 (standard treatment in analytical
  // chemistry texts, e.g. Harris, Quantitative Chemical Analysis, ch. on
  // monoprotic acid–base equilibria).
  it.each([[0.1, 4.76], [1e-3, 4.76], [1e-6, 4.76], [0.05, 9.21]])('acid C=%s, pKa %s', (C, pKa) => {
    const Ka = 10 ** -pKa
    // Two ways to enter the same solution: H+ from the charge balance (which then
    // reads h = [A-] + [OH-], the acid's proton condition), or a proton total C.
    const byCharge = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'balance', value: 0 }, { name: 'A-', charge: -1, mode: 'total', value: C }],
      species: [hydroxide(), { name: 'HA', nu: { 'H+': 1, 'A-': 1 }, logK: pKa }],
    })
    const byTotal = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'total', value: C }, { name: 'A-', charge: -1, mode: 'total', value: C }],
      species: [hydroxide(), { name: 'HA', nu: { 'H+': 1, 'A-': 1 }, logK: pKa }],
    })
    const h = rootIn((x) => x ** 3 + Ka * x * x - (Kw + Ka * C) * x - Ka * Kw, 1e-14, 1)
    for (const model of [byCharge, byTotal]) {
      const r = solve(model)
      expect(r.converged).toBe(true)
      expect(r.pH).toBeCloseTo(-Math.log10(h), 10)
    }
  })

  // Weak base B (total C) in water: [OH-] = [BH+] + [H+] gives, in h,
  // Kw/h = h + C h/(h + Ka) (Ka of BH+) — the same cubic in the base form:
  // h³ + (C + Ka) h² − Kw h − Ka Kw = 0 (same source).
  it.each([[0.1, 9.24], [1e-4, 9.24]])('base C=%s, pKa(BH+) %s', (C, pKa) => {
    const Ka = 10 ** -pKa
    const base = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'total', value: 0 }, { name: 'NH3', charge: 0, mode: 'total', value: C }],
      species: [hydroxide(), { name: 'NH4+', charge: 1, nu: { 'H+': 1, NH3: 1 }, logK: pKa }],
    })
    const h = rootIn((x) => x ** 3 + (C + Ka) * x * x - Kw * x - Ka * Kw, 1e-14, 1)
    const r = solve(base)
    expect(r.converged).toBe(true)
    expect(r.pH).toBeCloseTo(-Math.log10(h), 10)
  })
})

describe('fractions and complexes at fixed conditions', () => {
  // Diprotic acid H2A at fixed h: α0 = K1K2/D, α1 = K1 h/D, α2 = h²/D with
  // D = h² + K1 h + K1 K2 (standard ionisation fractions, e.g. Stumm & Morgan,
  // Aquatic Chemistry, ch. 3). Carbonate constants pKa 6.35 and 10.33 (from memory).
  it.each([4, 6.35, 8.3, 10.33, 12])('carbonate fractions at pH %s', (pH) => {
    const K1 = 10 ** -6.35
    const K2 = 10 ** -10.33
    const h = 10 ** -pH
    const CT = 2e-3
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'pH', value: pH }, { name: 'CO3^2-', charge: -2, mode: 'total', value: CT }],
      species: [hydroxide(), { name: 'HCO3-', charge: -1, nu: { 'CO3^2-': 1, 'H+': 1 }, logK: 10.33 },
        { name: 'H2CO3', nu: { 'CO3^2-': 1, 'H+': 2 }, logK: 16.68 }],
    })
    const D = h * h + K1 * h + K1 * K2
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(r.pH).toBe(pH)
    expect(species(r, 'H2CO3') / CT).toBeCloseTo((h * h) / D, 12)
    expect(species(r, 'HCO3-') / CT).toBeCloseTo((K1 * h) / D, 12)
    expect(species(r, 'CO3^2-') / CT).toBeCloseTo((K1 * K2) / D, 12)
  })

  // Metal M with ligand L held at fixed free concentration: [ML]/[M] = β1 [L],
  // [ML2]/[M] = β2 [L]², so α_M = 1/(1 + β1 L + β2 L²) (distribution of
  // complexes, Bjerrum's formation function; any coordination-chemistry text).
  // Ag+/NH3 constants log β1 3.31, log β2 7.22 (from memory).
  it.each([1e-6, 1e-4, 1e-3, 0.1])('silver ammine at free NH3 %s', (L) => {
    const b1 = 10 ** 3.31
    const b2 = 10 ** 7.22
    const MT = 1e-3
    const model = buildModel({
      components: [{ name: 'Ag+', charge: 1, mode: 'total', value: MT }, { name: 'NH3', charge: 0, mode: 'free', value: L }],
      species: [{ name: 'AgNH3+', charge: 1, nu: { 'Ag+': 1, NH3: 1 }, logK: 3.31 }, { name: 'Ag(NH3)2+', charge: 1, nu: { 'Ag+': 1, NH3: 2 }, logK: 7.22 }],
    })
    const D = 1 + b1 * L + b2 * L * L
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(species(r, 'NH3')).toBeCloseTo(L, 15)
    expect(species(r, 'Ag+') / MT).toBeCloseTo(1 / D, 12)
    expect(species(r, 'AgNH3+') / MT).toBeCloseTo((b1 * L) / D, 12)
    expect(species(r, 'Ag(NH3)2+') / MT).toBeCloseTo((b2 * L * L) / D, 12)
  })

  // Solubility of a salt MA of a weak acid at fixed pH: S² = Ksp (1 + h/Ka), i.e.
  // S = √(Ksp α_A⁻¹) (conditional solubility product; standard analytical
  // chemistry). Calcium fluoride-like 1:1 case with invented demo constants:
  // pKsp 8.0, pKa 3.17 (HF, from memory).
  it.each([2, 3.17, 5, 8])('solubility of MA at pH %s', (pH) => {
    const Ksp = 1e-8
    const Ka = 10 ** -3.17
    const h = 10 ** -pH
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'pH', value: pH }, { name: 'M+', charge: 1, mode: 'total', value: 0.1 },
        { name: 'A-', charge: -1, mode: 'total', value: 0.1 }],
      species: [hydroxide(), { name: 'HA', nu: { 'H+': 1, 'A-': 1 }, logK: 3.17 }],
      solids: [{ name: 'MA(s)', nu: { 'M+': 1, 'A-': 1 }, logK: 8 }],
    })
    const S = Math.sqrt(Ksp * (1 + h / Ka))
    const r = solve(model)
    expect(r.converged).toBe(true)
    expect(species(r, 'M+')).toBeCloseTo(S, 14)
    expect(species(r, 'M+') / S).toBeCloseTo(1, 10)
    const solid = r.solids.find((s) => s.name === 'MA(s)')!
    expect(solid.present).toBe(true)
    expect(solid.amount).toBeCloseTo(0.1 - S, 12)
    expect(Math.abs(solid.saturationIndex!)).toBeLessThan(1e-10)
  })
})
