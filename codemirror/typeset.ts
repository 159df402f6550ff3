/**
 * Formulas as chemists read them (`Cu(NH₃)₄²⁺`) from the caret form they
 * type (`Cu(NH3)4^2+`), shown in the hover card.
 */

const SUBSCRIPT: Record<string, string> = {
  '0': '₀', '1': '₁', '2': '₂', '3': '₃', '4': '₄', '5': '₅', '6': '₆', '7': '₇', '8': '₈', '9': '₉',
}
const SUPERSCRIPT: Record<string, string> = {
  '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹',
  '+': '⁺', '-': '⁻',
}
const PHASE = /\((s|g|aq)\)$/

/** `Cu(NH3)4^2+` → `Cu(NH₃)₄²⁺`, `CaSO4:2H2O(s)` → `CaSO₄·2H₂O(s)`. */
export function typesetFormula(caretForm: string): string {
  const phase = PHASE.exec(caretForm)?.[0] ?? ''
  const body = phase ? caretForm.slice(0, -phase.length) : caretForm
  const caret = body.indexOf('^')
  let formula = caret >= 0 ? body.slice(0, caret) : body
  let charge = caret >= 0 ? body.slice(caret + 1) : ''
  if (caret < 0 && /[+-]$/.test(formula)) {
    charge = formula.slice(-1)
    formula = formula.slice(0, -1)
  }
  let out = ''
  for (let i = 0; i < formula.length; i++) {
    const ch = formula[i]!
    const before = i > 0 ? formula[i - 1]! : ''
    const countsAtoms = /[A-Za-z)\u2080-\u2089]/.test(before) || (/\d/.test(before) && out.endsWith(SUBSCRIPT[before]!))
    if (/\d/.test(ch) && countsAtoms) out += SUBSCRIPT[ch]
    else if (ch === ':') out += '·'
    else out += ch
  }
  return out + [...charge].map((ch) => SUPERSCRIPT[ch] ?? ch).join('') + phase
}
