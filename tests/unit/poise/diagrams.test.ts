import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { diagramsHtml } from '../../../grammar/diagrams'

describe('grammar/diagrams.html', () => {
  it('is generated from the current parser (run npx tsx scripts/grammar-diagrams.ts when this fails)', () => {
    const committed = readFileSync(new URL('../../../grammar/diagrams.html', import.meta.url), 'utf8')
    expect(committed === diagramsHtml()).toBe(true)
  })
  it('loads nothing from the network', () => {
    const committed = readFileSync(new URL('../../../grammar/diagrams.html', import.meta.url), 'utf8')
    expect(committed).not.toMatch(/<(script|link)[^>]+(src|href)=/)
  })
})
