/**
 * Activity coefficients and temperature against their formulas.
 */
import { describe, expect, it } from 'vitest'
import { solve, sweep } from '../../../server/solver/index'
import { debyeHuckelA, debyeHuckelB, waterDensity, waterPermittivity } from '../../../server/solver/physics'
import { vantHoff } from '../../../shared/poise/thermo'
import { ionSizeAngstrom } from '../../../shared/poise/ionSize'
import { buildModel, hydroxide } from './modelBuilder'

/** A NaCl / CaSO4 medium of known ionic strength (no complexes, no H+ reactions). */
function medium(activity: 'davies' | 'debye-huckel', scale: number, fixedIonicStrength: number | null = null) {
  return buildModel({
    activity, fixedIonicStrength,
    components: [
      { name: 'Na+', charge: 1, mode: 'total', value: scale },
      { name: 'Cl-', charge: -1, mode: 'total', value: scale },
      { name: 'Ca^2+', charge: 2, mode: 'total', value: scale / 10 },
      { name: 'SO4^2-', charge: -2, mode: 'total', value: scale / 10 },
    ],
  })
}

describe('Davies and extended Debye–Hückel coefficients', () => {
  // Davies (1938): log10 γ = −A z² (√I/(1+√I) − 0.3 I); I = ½ Σ z² c (the
  // definitions, common practice). With no complexes I is known exactly:
  // 1·scale + 4·scale/10 = 1.4 scale.
  it.each([1e-4, 1e-3, 0.01, 0.1, 0.3])('Davies at I = 1.4 × %s', (scale) => {
    const r = solve(medium('davies', scale))
    expect(r.converged).toBe(true)
    const I = 1.4 * scale
    expect(r.ionicStrength).toBeCloseTo(I, 14)
    const A = debyeHuckelA(25)
    for (const s of r.species) {
      const expected = -A * s.charge ** 2 * (Math.sqrt(I) / (1 + Math.sqrt(I)) - 0.3 * I)
      expect(Math.log10(s.gamma)).toBeCloseTo(expected, 12)
      expect(s.activity).toBeCloseTo(s.concentration * s.gamma, 15)
    }
  })

  // Extended Debye–Hückel: log10 γ = −A z² √I / (1 + B å √I), å from
  // Kielland (1937), J. Am. Chem. Soc. 59, 1675 (from memory: Na+ 4, Cl- 3,
  // Ca^2+ 6, SO4^2- 4 Å).
  it.each([1e-4, 1e-3, 0.01, 0.05])('extended Debye–Hückel at I = 1.4 × %s', (scale) => {
    const r = solve(medium('debye-huckel', scale))
    expect(r.converged).toBe(true)
    const I = 1.4 * scale
    const A = debyeHuckelA(25)
    const B = debyeHuckelB(25)
    for (const s of r.species) {
      const a = ionSizeAngstrom(s.name, s.charge)
      const expected = (-A * s.charge ** 2 * Math.sqrt(I)) / (1 + B * a * Math.sqrt(I))
      expect(Math.log10(s.gamma)).toBeCloseTo(expected, 12)
    }
    expect(ionSizeAngstrom('Ca^2+', 2)).toBe(6)
    expect(ionSizeAngstrom('Cl-', -1)).toBe(3)
  })

  it('holds a fixed ionic strength instead of computing it', () => {
    const r = solve(medium('davies', 1e-3, 0.1))
    expect(r.ionicStrength).toBe(0.1)
    const A = debyeHuckelA(25)
    const ca = r.species.find((s) => s.name === 'Ca^2+')!
    expect(Math.log10(ca.gamma)).toBeCloseTo(-A * 4 * (Math.sqrt(0.1) / (1 + Math.sqrt(0.1)) - 0.03), 12)
  })

  it('warns when ionic strength is beyond the model’s usual range', () => {
    const r = solve(medium('davies', 1))
    expect(r.converged).toBe(true)
    expect(r.warnings?.some((w) => w.includes('above the usual range of the davies model'))).toBe(true)
    expect(solve(medium('davies', 0.01)).warnings?.some((w) => w.includes('usual range'))).toBe(false)
  })

  // A `free` concentration is a concentration: its activity follows γ.
  it('keeps a free concentration fixed while γ changes', () => {
    const model = buildModel({
      activity: 'davies',
      components: [{ name: 'Na+', charge: 1, mode: 'total', value: 0.1 }, { name: 'Cl-', charge: -1, mode: 'free', value: 0.1 }],
    })
    const r = solve(model)
    expect(r.converged).toBe(true)
    const cl = r.species.find((s) => s.name === 'Cl-')!
    expect(cl.concentration).toBeCloseTo(0.1, 14)
    expect(cl.gamma).toBeLessThan(0.8)
  })
})

describe('temperature', () => {
  // Debye–Hückel A at 25 °C: 0.5091 kg^½ mol^−½ (Helgeson (1969), Am. J. Sci.
  // 267, 729, from memory) and 0.5085 in several texts; the permittivity used
  // here (Malmberg & Maryott 1956: 78.30 at 25 °C) gives 0.511, within 0.4 %.
  it('Debye–Hückel A is about 0.509 at 25 °C and grows with temperature', () => {
    expect(debyeHuckelA(25)).toBeGreaterThan(0.5085 - 0.003)
    expect(debyeHuckelA(25)).toBeLessThan(0.5091 + 0.003)
    // B ≈ 0.3283 Å⁻¹ kg^½ mol^−½ at 25 °C (same source, from memory).
    expect(debyeHuckelB(25)).toBeCloseTo(0.3283, 2)
    // A rises with T: about 0.492 at 0 °C and 0.60 at 100 °C (same source, from memory).
    expect(debyeHuckelA(0)).toBeCloseTo(0.492, 2)
    expect(debyeHuckelA(100)).toBeGreaterThan(0.59)
    expect(debyeHuckelA(100)).toBeLessThan(0.62)
    // Water's relative permittivity: 87.74 at 0 °C, 78.3 at 25 °C (Malmberg & Maryott 1956, from memory).
    expect(waterPermittivity(25)).toBeCloseTo(78.3, 1)
  })

  // Density of air-free water at 1 atm: 999.972 kg/m³ at 4 °C, 997.047 at
  // 25 °C, 958.35 at 100 °C (Kell (1975), J. Chem. Eng. Data 20, 97, Table
  // values of the same correlation the function implements).
  it('water density follows Kell (1975): 997.05 kg/m³ at 25 °C', () => {
    expect(waterDensity(25)).toBeCloseTo(997.047, 2)
    expect(waterDensity(4)).toBeCloseTo(999.972, 2)
    expect(waterDensity(0)).toBeCloseTo(999.83952, 5)
    expect(waterDensity(100)).toBeCloseTo(958.35, 1)
  })

  // van 't Hoff: log10 K(T) = log10 K(T0) − ΔH/(R ln 10) (1/T − 1/T0), the
  // integrated form with constant ΔH (any physical-chemistry text).
  it('moves every constant by van ’t Hoff along a temperature sweep', () => {
    const R = 8.31446261815324 // J/(mol K): N_A × k_B, both exact in the 2019 SI (BIPM SI Brochure, 9th ed.)
    const temps = [5, 15, 25, 40, 60]
    const model = buildModel({
      components: [{ name: 'H+', charge: 1, mode: 'total', value: 0 }],
      // Water: pKw 14.00, ΔH(dissociation) = 55.84 kJ/mol (from memory):
      // formation of OH- from H+ is the dissociation, logK −14.
      species: [{ ...hydroxide(14), dH: 55.84 }],
      sweep: { variable: 'temperature', component: null, values: temps },
    })
    const out = sweep(model)
    out.points.forEach((r, k) => {
      expect(r.converged).toBe(true)
      expect(r.temperatureC).toBe(temps[k])
      const logKw = -14 - (55840 / (R * Math.LN10)) * (1 / (temps[k] + 273.15) - 1 / 298.15)
      expect(vantHoff(-14, 55.84, temps[k], 25)).toBeCloseTo(logKw, 12)
      // Pure water: pH = −½ log10 Kw.
      expect(r.pH).toBeCloseTo(-logKw / 2, 10)
    })
    // Neutral pH of water at 60 °C is near 6.5 (from memory; common practice).
    expect(out.points[4].pH).toBeGreaterThan(6.4)
    expect(out.points[4].pH).toBeLessThan(6.6)
  })
})
