/**
 * "Use these values" on the text: each fitted constant's number, its ± and
 * its citation rewritten on its own line, everything else kept, and the
 * result compiles to the fitted values with the data set cited.
 */
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import { fitCitation, withFittedValues } from '../../../shared/fit/constants'

const dataset = { name: 'run "7"', sha256: 'ab'.repeat(32) }
const text = `system "Two constants"
component H+ balance
component CH3COO- total 10 mmol/L
source memory "from memory"
reaction H2O <=> H+ + OH-   pKw 14.00 ± 0.05 fit  cite memory  # water
reaction CH3COOH <=> CH3COO- + H+   Ka 1.8e-5 fit
`

describe('withFittedValues', () => {
  const out = withFittedValues(text, [{ line: 5, value: 13.9962, standardError: 0.0123 }, { line: 6, value: 1.7412e-5, standardError: 2.3e-7 }], dataset)!

  it('replaces the number and an existing ±, and the cite, keeping fit and the comment', () => {
    expect(out.split('\n')[4]).toBe(`reaction H2O <=> H+ + OH-   pKw 13.996 ± 0.012 fit  cite "${fitCitation(dataset)}"  # water`)
  })
  it('writes a K in exponent form, and adds the cite where there was none', () => {
    expect(out.split('\n')[5]).toBe(`reaction CH3COOH <=> CH3COO- + H+   Ka 1.741e-5 ± 2.3e-7 fit  cite "fitted to data set run '7' (sha256 ${'ab'.repeat(32)})"`)
  })
  it('compiles to the fitted values with their ± and the data set cited', () => {
    const model = compile(out).model!
    const water = model.reactions.find((r) => r.kind === 'pKw')!
    expect(water).toMatchObject({ value: 13.996, uncertainty: 0.012, fit: true, cite: fitCitation(dataset) })
    expect(model.reactions.find((r) => r.kind === 'Ka')).toMatchObject({ value: 1.741e-5, uncertainty: 2.3e-7, fit: true })
  })
  it('leaves a constant the data did not determine as written, and refuses a line without a constant', () => {
    expect(withFittedValues(text, [{ line: 6, value: 2e-5, standardError: null }], dataset)).toBe(text)
    expect(withFittedValues(text, [{ line: 2, value: 1, standardError: 0.1 }], dataset)).toBeNull()
  })
})
