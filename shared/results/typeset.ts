/**
 * Display forms for results: formulas typeset from the caret form the
 * language uses (`SO4^2-` → `SO₄²⁻`), and numbers formatted for tables
 * (scientific notation with three significant figures, log10 to two
 * decimals). Exports never go through here: they keep full precision.
 */

const SUBSCRIPT_DIGITS = '₀₁₂₃₄₅₆₇₈₉'
const SUPERSCRIPT_DIGITS = '⁰¹²³⁴⁵⁶⁷⁸⁹'

function subscript(digits: string): string {
  return [...digits].map((d) => SUBSCRIPT_DIGITS[Number(d)]).join('')
}

function superscript(digits: string): string {
  return [...digits].map((d) => SUPERSCRIPT_DIGITS[Number(d)]).join('')
}

const PHASE_SUFFIX = /\((?:s|g|aq|l)\)$/
/** `^2+`, `^+`, `^3-` at the end, or a bare single `+`/`-` (`H+`, `OH-`). */
const CARET_CHARGE = /\^(\d*)([+-])$/
const BARE_CHARGE = /([A-Za-z0-9)\]])([+-])$/

/**
 * Typeset the body of a formula (no charge, no phase): atom counts become
 * subscripts; the count that opens a hydrate part after `·` or `:` is a
 * coefficient and stays on the line (`CaSO4·2H2O`).
 */
function typesetBody(body: string): string {
  return body
    .split(/[·:]/)
    .map((part, index) => {
      const coefficient = index > 0 ? (/^\d+/.exec(part)?.[0] ?? '') : ''
      const rest = part.slice(coefficient.length)
      return coefficient + rest.replace(/(?<=[A-Za-z)\]])\d+/g, subscript)
    })
    .join('·')
}

/**
 * Typeset a formula written in caret form for reading: `Ca^2+` → `Ca²⁺`,
 * `Cu(NH3)4^2+` → `Cu(NH₃)₄²⁺`, `H+` → `H⁺`, `CaCO3(s)` → `CaCO₃(s)`.
 * Text already typeset, or that is not a formula, comes back unchanged.
 */
export function typesetFormula(caret: string): string {
  let rest = caret.trim()
  const phase = PHASE_SUFFIX.exec(rest)?.[0] ?? ''
  rest = rest.slice(0, rest.length - phase.length)

  let charge = ''
  const caretCharge = CARET_CHARGE.exec(rest)
  if (caretCharge) {
    const [whole, digits, sign] = caretCharge
    charge = superscript(digits === '1' ? '' : digits) + (sign === '+' ? '⁺' : '⁻')
    rest = rest.slice(0, rest.length - whole.length)
  } else {
    const bare = BARE_CHARGE.exec(rest)
    if (bare) {
      charge = bare[2] === '+' ? '⁺' : '⁻'
      rest = rest.slice(0, rest.length - 1)
    }
  }
  return typesetBody(rest) + charge + phase
}

/** What a table shows for a value that is not a number. */
export const NOT_A_NUMBER = '—'

/**
 * Scientific notation for concentrations and amounts: `1.23e-5`, `4.50e+0`
 * written as `4.50e0`. Zero is `0`; NaN is a dash; infinities are `∞`/`−∞`.
 */
export function formatScientific(value: number, significant = 3): string {
  if (Number.isNaN(value)) return NOT_A_NUMBER
  if (value === Infinity) return '∞'
  if (value === -Infinity) return '−∞'
  if (value === 0) return '0'
  const [mantissa, exponent] = value.toExponential(Math.max(0, significant - 1)).split('e')
  return `${mantissa}e${Number(exponent)}`
}

/** A fixed number of decimals (log10 values, pH, saturation indices); `-0.00` shows as `0.00`. */
export function formatFixed(value: number, decimals = 2): string {
  if (Number.isNaN(value)) return NOT_A_NUMBER
  if (value === Infinity) return '∞'
  if (value === -Infinity) return '−∞'
  const text = value.toFixed(decimals)
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text
}

/** log10 of a positive quantity to two decimals; log10 of 0 is −∞. */
export function formatLog10(value: number, decimals = 2): string {
  if (Number.isNaN(value) || value < 0) return NOT_A_NUMBER
  return formatFixed(Math.log10(value), decimals)
}

/** A share (0..1) as a percentage with one decimal: `0.1234` → `12.3 %`. */
export function formatPercent(share: number, decimals = 1): string {
  if (!Number.isFinite(share)) return NOT_A_NUMBER
  return `${formatFixed(share * 100, decimals)} %`
}
