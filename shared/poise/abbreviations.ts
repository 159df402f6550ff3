/**
 * `abbreviation NAME = FORMULA`: a group of atoms a file names once (a
 * ligand: `abbreviation Cit = C6H5O7`) and then writes inside formulas
 * (`Cit^3-`, `HCit^2-`, `NiCit-`, `Ni(Cit)2^4-`). The formula keeps the name
 * as written (results and exports show `NiCit-`); its composition counts the
 * atoms, so charge, molar mass and the balance of every reaction are checked
 * as for any formula.
 *
 * Rules (each refusal says what to change):
 * - the name is a capital letter and letters only (P013), is no element
 *   symbol (P013: `Co` is cobalt) and cannot be read as a formula of
 *   elements (P013: `CN` is carbon and nitrogen), so an abbreviation never
 *   changes what an existing formula means;
 * - it stands for a neutral group of atoms with no phase (P013): the charge
 *   is written on each species (`Cit^3-`, `HCit^2-`);
 * - it is defined once (P031) and above its first use (P014), so a file
 *   reads from top to bottom;
 * - a word that is neither an element symbol nor a defined abbreviation is
 *   P011, whose message offers the abbreviation line.
 */
import type { Reporter } from './reporter'
import type { Statement } from './statements'
import { isElement } from './elements'
import { ABBREVIATION_NAME, formatCharge, parseFormula, type Abbreviation, type Abbreviations } from './formula'

type AbbreviationStatement = Extract<Statement, { kind: 'abbreviation' }>

/** The table of a file's abbreviations; a refused line is left out (its names then read as unknown, reported where defined). */
export function compileAbbreviations(statements: AbbreviationStatement[], report: Reporter): { table: Abbreviations; refused: Set<string> } {
  const table = new Map<string, Abbreviation>()
  const refused = new Set<string>()
  for (const s of statements) {
    const name = s.name.image
    // The name as later formulas would write it (the letters of `Cit^3-`), so its uses are not reported again.
    const letters = /^[A-Z][A-Za-z]*/.exec(name)?.[0] ?? name
    const refuse = (message: string, at: { from: number; to: number } = s.name) => {
      report.error('P013', message, at)
      refused.add(letters)
    }
    if (!ABBREVIATION_NAME.test(name)) {
      refuse(/[\^+\-⁺⁻]|\(/.test(name)
        ? `an abbreviation names a group of atoms, with no charge or phase: write \`abbreviation ${letters} = …\` and the charge on each species that uses it (${letters}^3-)`
        : `an abbreviation's name is a capital letter and up to 11 more letters, with no digits (a digit would read as a count): such as Cit, Ox, En, EDTA`)
      continue
    }
    if (isElement(name)) { refuse(`${name} is an element symbol, so it cannot name an abbreviation: choose another name (such as ${name}x)`); continue }
    const asElements = parseFormula(name).formula
    if (asElements) {
      refuse(`${name} already reads as a formula (${Object.keys(asElements.elements).join(' ')}), so it cannot name an abbreviation: choose a name that is not made of element symbols (such as ${name}x)`)
      continue
    }
    if (table.has(name)) {
      const first = table.get(name)!
      report.error('P031', `abbreviation ${name} is defined twice (first on line ${report.lineOf(first.from)}): keep one`, s.name)
      continue
    }
    const parsed = parseFormula(s.formula.image)
    if (!parsed.formula) {
      const p = parsed.problem!
      report.error(p.code, p.message, { from: s.formula.from + p.from, to: s.formula.from + Math.max(p.to, p.from + 1) })
      refused.add(letters)
      continue
    }
    const f = parsed.formula
    if (f.charge !== 0 || f.phase !== 'aq' || /\(aq\)$/.test(s.formula.image)) {
      refuse(`an abbreviation stands for a neutral group of atoms with no phase: write \`abbreviation ${name} = ${s.formula.image.replace(/\((?:s|g|aq)\)$/, '').replace(/\^?\d*[+-]$|[⁰¹²³⁴⁵⁶⁷⁸⁹]*[⁺⁻]$/, '')}\` and the charge on each species (${name}${formatCharge(name, f.charge || -3)})`, s.formula)
      continue
    }
    table.set(name, { name, formula: f.name, elements: f.elements, from: s.name.from })
  }
  return { table, refused }
}
