import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { diagramsHtml, diagramsJson } from '../../../grammar/diagrams'
import { withGeneratedTables } from '../../../grammar/reference'

describe('grammar/diagrams.html', () => {
  it('is generated from the current parser (run npx tsx scripts/grammar-diagrams.ts when this fails)', () => {
    const committed = readFileSync(new URL('../../../grammar/diagrams.html', import.meta.url), 'utf8')
    expect(committed === diagramsHtml()).toBe(true)
  })
  it('has its static twin grammar/diagrams.json current, with a diagram for every statement keyword', () => {
    const committed = readFileSync(new URL('../../../grammar/diagrams.json', import.meta.url), 'utf8')
    expect(committed === diagramsJson()).toBe(true)
    const keywords = (JSON.parse(committed) as { rules: { keyword: string | null; svg: string }[] }).rules.map((r) => r.keyword).filter(Boolean)
    expect(keywords).toEqual(expect.arrayContaining(['system', 'component', 'reaction', 'abbreviation', 'sweep', 'titrate']))
  })
  it('loads nothing from the network', () => {
    const committed = readFileSync(new URL('../../../grammar/diagrams.html', import.meta.url), 'utf8')
    expect(committed).not.toMatch(/<(script|link)[^>]+(src|href)=/)
  })
})

describe('grammar/README.md generated tables', () => {
  it('show the current limits and ion sizes (run npx tsx scripts/grammar-diagrams.ts when this fails)', () => {
    const committed = readFileSync(new URL('../../../grammar/README.md', import.meta.url), 'utf8')
    expect(committed === withGeneratedTables(committed)).toBe(true)
    expect(committed).toContain('| `pH` | from -2 to 16')
    expect(committed).toContain('| 9 Å | `H+`')
  })
})
