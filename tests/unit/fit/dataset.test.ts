/**
 * Reading a data set's CSV: the headers it understands, and for every
 * mistake the line and column and what to write instead; a file with any
 * mistake gives no data.
 */
import { describe, expect, it } from 'vitest'
import { parseDataSet, problemText, type DataSetProblem } from '../../../shared/fit/dataset'
import { MAX_DATASET_COLUMNS, MAX_DATASET_ROWS } from '../../../shared/poise/limits'
import { formatWithError } from '../../../shared/fit/constants'

function problems(csv: string): DataSetProblem[] {
  const r = parseDataSet(csv)
  expect(r.ok).toBe(false)
  return r.ok ? [] : r.problems
}

describe('headers and rows that read', () => {
  it('reads a titration: volume in mL, pH, a species, its log and a dissolved total', () => {
    const r = parseDataSet('volume mL,pH,Cu^2+ mmol/L,log CuOH+,dissolved Cu mg/L\n0,3.10,0.5,-6.2,31.7\n0.5,3.25,,-6.0,30.1\n')
    expect(r).toEqual({
      ok: true,
      data: {
        headers: ['volume mL', 'pH', 'Cu^2+ mmol/L', 'log CuOH+', 'dissolved Cu mg/L'],
        study: { kind: 'volume', unit: 'mL' },
        measured: [
          { kind: 'pH' },
          { kind: 'species', species: 'Cu^2+', unit: 'mmol/L' },
          { kind: 'log', species: 'CuOH+' },
          { kind: 'dissolved', target: 'Cu', unit: 'mg/L' },
        ],
        rows: [[0, 3.1, 0.5, -6.2, 31.7], [0.5, 3.25, null, -6, 30.1]],
      },
    })
  })
  it('reads a pH or total sweep, semicolons, a byte-order mark, Windows line ends and blank lines', () => {
    const pH = parseDataSet('\uFEFFpH;dissolved Ni^2+ µg/L\r\n6;120\r\n\r\n7;15.5\r\n')
    expect(pH.ok && pH.data.study).toEqual({ kind: 'pH' })
    expect(pH.ok && pH.data.rows).toEqual([[6, 120], [7, 15.5]])
    const total = parseDataSet('total Cu^2+ mol/L,log Cu^2+\n1e-4,-4.3\n2e-4,-4.0\n')
    expect(total.ok && total.data.study).toEqual({ kind: 'total', component: 'Cu^2+', unit: 'mol/L' })
  })
})

describe('mistakes, each with its line and column', () => {
  it('names a study variable it does not know and says what to write', () => {
    const [p] = problems('time s,pH\n1,7\n')
    expect(p).toMatchObject({ line: 1, column: 1 })
    expect(p!.message).toContain('"time s" is not a study variable')
    expect(p!.message).toContain('`volume mL`')
    expect(problems('volume ml,pH\n1,7\n')[0]!.message).toBe('"volume ml" is not a study variable: write `volume mL` or `volume L` for the added volume of a titration')
  })
  it('names a measured column it does not know, a unit that is not one, and a repeated column', () => {
    const found = problems('pH,Cu^2+ ppm,temperature,pH,pH\n7,1,25,7,7\n')
    expect(found.map((p) => [p.line, p.column])).toEqual([[1, 2], [1, 3], [1, 5]])
    expect(found[0]!.message).toBe('"Cu^2+ ppm": ppm is not a concentration unit such as mol/L, mmol/L or mg/L')
    expect(found[1]!.message).toContain('"temperature" is not a measurement')
    expect(found[2]!.message).toBe('"pH" is column 4 already: keep one of the two')
  })
  it('names a cell that is not a number, with the fix for a decimal comma', () => {
    const found = problems('volume mL;pH\n0;3,5\n1;abc\n2;4.1\n')
    expect(found).toEqual([
      { line: 2, column: 2, message: '"3,5" in pH is not a number: write 3.5 (a point, not a comma, before the decimals)' },
      { line: 3, column: 2, message: '"abc" in pH is not a number: write a number such as 0.5 or 1.2e-3' },
    ])
    expect(problemText(found[0]!, ['volume mL', 'pH'])).toBe('line 2, column 2 (pH): "3,5" in pH is not a number: write 3.5 (a point, not a comma, before the decimals)')
  })
  it('counts lines as the file does, blank lines included', () => {
    const found = problems('volume mL,pH\n0,3.1\n\n\n1,x\n')
    expect(found).toEqual([{ line: 5, column: 2, message: '"x" in pH is not a number: write a number such as 0.5 or 1.2e-3' }])
  })
  it('refuses short rows, empty study values, rows without a measurement, negative volumes and concentrations of 0', () => {
    const found = problems('volume mL,pH,Cu^2+ mol/L\n0,3.1\n,3.2,1e-3\n1,,\n-1,4,1e-3\n2,4,0\n')
    expect(found.map((p) => [p.line, p.column])).toEqual([[2, 3], [3, 1], [4, 2], [5, 1], [6, 3]])
    expect(found[0]!.message).toBe('this line has 2 cells and the header 3: give every column a value (leave a measurement empty as ,,)')
    expect(found[1]!.message).toBe('volume mL is empty: every row needs its study variable')
    expect(found[2]!.message).toBe('this row has no measured value: fill one in or delete the row')
    expect(found[3]!.message).toBe('an added volume cannot be negative (-1)')
    expect(found[4]!.message).toBe('Cu^2+ mol/L must be above 0, not 0: leave the cell empty when nothing was measured')
  })
  it('refuses an empty file, a header alone, a single column, and more rows or columns than the limits', () => {
    expect(problems('')[0]!.message).toMatch(/^The file is empty\./)
    expect(problems('volume mL,pH\n')).toEqual([{ line: 2, column: null, message: 'The file has a header and no data: add one row of numbers per measurement' }])
    expect(problems('pH\n7\n')[0]!.message).toMatch(/^A data set needs the study variable and at least one measured column/)
    const wide = ['pH', ...Array.from({ length: MAX_DATASET_COLUMNS }, (_, i) => `log X${i}`)].join(',')
    expect(problems(`${wide}\n`)[0]).toMatchObject({ line: 1, column: MAX_DATASET_COLUMNS + 1 })
    const long = 'pH,log Cu^2+\n' + Array.from({ length: MAX_DATASET_ROWS + 1 }, (_, i) => `${i / 100},-5`).join('\n')
    expect(problems(long)[0]).toMatchObject({ line: MAX_DATASET_ROWS + 2, column: null, message: expect.stringContaining(`at most ${MAX_DATASET_ROWS} rows`) })
  })
})

describe('a fitted value as a person writes it', () => {
  it('gives the error two significant digits and the value the same last decimal', () => {
    expect(formatWithError(4.70344, 0.01234)).toEqual({ value: '4.703', error: '0.012' })
    expect(formatWithError(19.3, 0.27)).toEqual({ value: '19.30', error: '0.27' })
    expect(formatWithError(1.754e-5, 1.2e-7)).toEqual({ value: '1.754e-5', error: '1.2e-7' })
    expect(formatWithError(4.7, null)).toEqual({ value: '4.7', error: null })
  })
})
