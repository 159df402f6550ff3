/**
 * An independent check of a Result: recomputes every species from the
 * reported log10 activities of the components in 40-digit decimal arithmetic
 * (decimal.js), then the mass and charge balances and the saturation indices.
 * It shares no code with the solver.
 */
import Decimal from 'decimal.js'
import type { Model } from '../../../shared/poise/model'
import type { Result } from '../../../shared/types/result'

const D = Decimal.clone({ precision: 40 })

export interface Verification {
  /** Largest relative misclosure of a mass or charge balance. */
  worstBalance: number
  worstBalanceName: string
  /** Largest saturation index among non-suppressed solids that are absent. */
  worstSupersaturation: number
  /** Largest |SI| among solids reported present. */
  worstPresentSI: number
  negativeAmount: boolean
}

function logActivity(model: Model, result: Result, j: number): Decimal {
  const comp = model.components[j]
  if (comp.mode === 'pH') return new D(-comp.value)
  if (comp.mode === 'pressure') return D.log10(comp.value)
  if (comp.mode === 'excess') return new D(0)
  const own = result.species.find((s) => s.name === comp.name)
  if (!own) throw new Error(`result lacks the free form of ${comp.name}`)
  // No log10 at all: the component is absent (total 0), its activity is 0.
  if (own.log10 === null) return new D(-Infinity)
  if (own.concentration === 0) return new D(own.log10)
  return new D(own.log10).plus(D.log10(own.gamma))
}

export function verifyResult(model: Model, result: Result): Verification {
  const la = model.components.map((_, j) => logActivity(model, result, j))
  const conc = model.species.map((s) => {
    const rep = result.species.find((x) => x.name === s.name)
    if (!rep) throw new Error(`result lacks species ${s.name}`)
    let l = new D(s.logK)
    s.nu.forEach((v, j) => { if (v !== 0) l = l.plus(la[j].times(v)) })
    return D.pow(10, l).div(rep.gamma)
  })
  const amounts = model.solids.map((s) => {
    const rep = result.solids.find((x) => x.name === s.name)!
    return rep.present ? new D(rep.amount) : new D(0)
  })
  let worstBalance = 0
  let worstBalanceName = ''
  model.components.forEach((comp, j) => {
    let sum = new D(0)
    let mag = new D(0)
    if (comp.mode === 'total') {
      model.species.forEach((s, i) => { const q = conc[i].times(s.nu[j]); sum = sum.plus(q); mag = mag.plus(q.abs()) })
      model.solids.forEach((s, k) => { const q = amounts[k].times(s.nu[j]); sum = sum.plus(q); mag = mag.plus(q.abs()) })
      sum = sum.minus(comp.value)
      mag = D.max(mag, Math.abs(comp.value))
    } else if (comp.mode === 'balance') {
      model.species.forEach((s, i) => { const q = conc[i].times(s.charge); sum = sum.plus(q); mag = mag.plus(q.abs()) })
    } else return
    const rel = mag.isZero() ? 0 : sum.abs().div(mag).toNumber()
    if (rel > worstBalance) { worstBalance = rel; worstBalanceName = comp.name }
  })
  let worstSupersaturation = -Infinity
  let worstPresentSI = 0
  let negativeAmount = false
  model.solids.forEach((s, k) => {
    let si = new D(s.logK)
    s.nu.forEach((v, j) => { if (v !== 0) si = si.plus(la[j].times(v)) })
    const rep = result.solids.find((x) => x.name === s.name)!
    if (rep.present) {
      worstPresentSI = Math.max(worstPresentSI, si.abs().toNumber())
      if (rep.amount < 0) negativeAmount = true
    } else if (!s.suppressed) {
      worstSupersaturation = Math.max(worstSupersaturation, si.toNumber())
    }
  })
  return { worstBalance, worstBalanceName, worstSupersaturation, worstPresentSI, negativeAmount }
}

/** True when some number anywhere in the value is NaN or infinite. */
export function hasNonFinite(value: unknown): boolean {
  if (typeof value === 'number') return !Number.isFinite(value)
  if (Array.isArray(value)) return value.some(hasNonFinite)
  if (value && typeof value === 'object') return Object.values(value).some(hasNonFinite)
  return false
}
