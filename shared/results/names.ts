/**
 * The names that keep a component's free ion apart from its dissolved total
 * everywhere results are shown: "free Ni²⁺" is the concentration of the ion
 * Ni²⁺ itself; "dissolved Ni" is Σ ν·c over every aqueous species holding
 * Ni (the component's `dissolved` in the Result). Never the same label for
 * both.
 */
import { typesetFormula } from './typeset'
import { withoutCharge } from '../poise/limitStatement'

/** The formula of a component without its charge and phase: `Ni^2+` → `Ni`, `SO4^2-` → `SO4`, `H+` → `H`. */
export const componentCore = withoutCharge

/** "free Ni²⁺": the component's free form. */
export function freeLabel(component: string): string {
  return `free ${typesetFormula(component)}`
}

/** "dissolved Ni": the component's dissolved total, by its formula without charge. */
export function dissolvedLabel(component: string): string {
  return `dissolved ${typesetFormula(componentCore(component))}`
}

/** The same label in plain caret text, for CSV headers and the command line: "dissolved SO4". */
export function dissolvedText(component: string): string {
  return `dissolved ${componentCore(component)}`
}

/**
 * Whether a component's dissolved total means something to show under its
 * own name: not for H+, whose "total" is a proton balance (OH- holds −1 of
 * it), so "dissolved H" would name nothing a chemist measures.
 */
export function hasDissolvedTotal(component: string): boolean {
  return component !== 'H+'
}
