/** `component` statements: formula, mode and value checks, and independence. */
import type { ModelComponent } from './model'
import type { ParsedFormula } from './formula'
import type { Reporter } from './reporter'
import type { Statement } from './statements'
import { unitInfo, UNIT_HINTS } from './units'
import { checkRange } from './limits'

type ComponentStatement = Extract<Statement, { kind: 'component' }>

export interface CheckedComponent { model: ModelComponent; formula: ParsedFormula; stmt: ComponentStatement }

/** Checks one component against its formula; returns the model entry or null when it is unusable. */
export function checkComponent(stmt: ComponentStatement, f: ParsedFormula, report: Reporter): ModelComponent | null {
  const name = f.name
  const line = report.lineOf(stmt.from)
  // Copied: formula results are shared through a cache.
  const base = { name, charge: f.charge, phase: f.phase, elements: { ...f.elements }, molarMass: f.molarMass ?? 0, line }
  if (name === 'H2O') {
    report.error('P057', 'H2O is the solvent (activity 1), never a component: remove this line', stmt.formula)
    return null
  }
  const spec = stmt.spec
  if (!spec) {
    if (name === 'H+') return { ...base, mode: 'balance', value: 0 }
    const hint = f.phase === 's' ? 'excess' : f.phase === 'g' ? 'pressure N atm' : 'total N mmol/L, free N mmol/L or balance'
    report.error('P059', `component ${name} needs a spec: write ${hint} after it`, stmt.formula)
    return null
  }
  if (f.phase === 's' && spec.mode !== 'excess') {
    report.error('P056', `a solid component is always in contact with an unlimited amount of it: write \`component ${name} excess\``, spec.tok)
    return null
  }
  if (f.phase === 'g' && spec.mode !== 'pressure') {
    report.error('P054', `a gas component has a fixed partial pressure: write \`component ${name} pressure N atm\``, spec.tok)
    return null
  }
  switch (spec.mode) {
    case 'balance':
      if (f.charge === 0) {
        report.error('P058', `${name} carries no charge, so it cannot close the charge balance: choose a charged component for balance`, spec.tok)
        return null
      }
      return { ...base, mode: 'balance', value: 0 }
    case 'excess':
      if (f.phase !== 's') {
        report.error('P056', `excess is only for a solid, written with (s): ${name} is not one`, spec.tok)
        return null
      }
      return { ...base, mode: 'excess', value: 0 }
    case 'pH': {
      if (name !== 'H+') {
        report.error('P053', `pH can only be given for H+, not for ${name}`, spec.tok)
        return null
      }
      const q = spec.quantity!
      if (!checkRange(report, 'pH', q.value, q.number)) return null
      return { ...base, mode: 'pH', value: q.value }
    }
    case 'pressure': {
      if (f.phase !== 'g') {
        report.error('P054', `pressure is only for a gas, written with (g): ${name} is not one`, spec.tok)
        return null
      }
      const q = spec.quantity!
      if (!q.unit) { report.error('P050', `expected ${UNIT_HINTS.pressure} after ${q.number.image}`, q.number); return null }
      const info = unitInfo(q.unit.image)
      if (!info || info.dimension !== 'pressure') { report.error('P050', `${q.unit.image} is not a pressure: use atm, bar, kPa or Pa`, q.unit); return null }
      if (q.value <= 0) { report.error('P052', 'a partial pressure must be positive', q.number); return null }
      if (!checkRange(report, 'pressure', q.value * info.factor, q.number)) return null
      return { ...base, mode: 'pressure', value: q.value * info.factor }
    }
    case 'total':
    case 'free': {
      const q = spec.quantity!
      if (!q.unit) { report.error('P050', `expected ${UNIT_HINTS.concentration} after ${q.number.image}`, q.number); return null }
      const info = unitInfo(q.unit.image)
      if (!info || (info.dimension !== 'concentration' && info.dimension !== 'mass-concentration')) {
        report.error('P050', `${q.unit.image} is not a concentration: use ${UNIT_HINTS.concentration}`, q.unit)
        return null
      }
      let value = q.value * info.factor
      if (info.dimension === 'mass-concentration') {
        if (f.molarMass === null) {
          report.error('P051', `${name} contains an element with no standard atomic weight, so ${q.unit.image} cannot be converted: give it in mol/L`, q.unit)
          return null
        }
        value /= f.molarMass
      }
      if (spec.mode === 'total' && value < 0 && name !== 'H+') {
        report.error('P052', `a total cannot be negative (only H+ may be, as a proton deficit): ${name}`, q.number)
        return null
      }
      if (spec.mode === 'free' && value <= 0) {
        report.error('P052', 'a free concentration must be positive', q.number)
        return null
      }
      const what = spec.mode === 'total' ? `the total of ${name}` : `the free concentration of ${name}`
      if (!checkRange(report, 'concentration', value, q.unit ?? q.number, { magnitude: name === 'H+', what })) return null
      return { ...base, mode: spec.mode, value }
    }
  }
}
