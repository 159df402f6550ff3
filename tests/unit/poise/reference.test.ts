import { readdirSync, readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { allTokens } from '../../../shared/poise/tokens'

const dir = new URL('../../../shared/poise/', import.meta.url)
const reference = readFileSync(new URL('../../../grammar/README.md', import.meta.url), 'utf8')
const sources = readdirSync(dir).filter((f) => f.endsWith('.ts')).map((f) => readFileSync(new URL(f, dir), 'utf8')).join('\n')

describe('grammar/README.md stays in step with the code', () => {
  it('documents every diagnostic code the compiler emits', () => {
    const used = [...new Set([...sources.matchAll(/'([PW]\d{3})'/g)].map((m) => m[1]!))]
    expect(used.length).toBeGreaterThan(30)
    for (const code of used) expect(reference, code).toContain(`| ${code} |`)
  })
  it('names every token the highlighter can receive', () => {
    for (const t of allTokens) {
      if (t.name === 'Newline' || t.name === 'Whitespace') continue
      expect(reference, t.name).toContain(`\`${t.name}\``)
    }
  })
})
