import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { EditorState } from '@codemirror/state'
import { referenceAt, statementAt } from '../../../codemirror/reference'
import { referencePage, type DiagramsFile } from '../../../utils/referenceHtml'
import { KEYWORD_TOKENS } from '../../../shared/poise/tokens'

const readme = readFileSync(new URL('../../../grammar/README.md', import.meta.url), 'utf8')
const diagrams = JSON.parse(readFileSync(new URL('../../../grammar/diagrams.json', import.meta.url), 'utf8')) as DiagramsFile

describe('the reference page', () => {
  const page = referencePage(readme, diagrams)

  it('has an anchor and a syntax diagram for every statement of the grammar', () => {
    const statements = diagrams.rules.filter((r) => r.keyword).map((r) => r.keyword!)
    expect(statements.length).toBeGreaterThan(10)
    for (const keyword of statements) {
      expect(page.html, keyword).toMatch(new RegExp(`id="${keyword}"`))
      expect(page.html, keyword).toContain(`aria-label="syntax of ${keyword}"`)
    }
  })

  it('names only statement keywords of the lexer as statement anchors', () => {
    const words = new Set(KEYWORD_TOKENS.map((t) => String(t.PATTERN)))
    for (const c of page.contents.filter((c) => c.level === 3)) expect(words.has(c.id), c.id).toBe(true)
  })

  it('turns the README links into addresses of the app, and keeps no generator markers', () => {
    expect(page.html).toContain('href="/examples"')
    expect(page.html).toContain('href="#syntax-diagrams"')
    expect(page.html).toContain('id="syntax-diagrams"')
    expect(page.html).not.toContain('limits:begin')
  })

  it('is the same HTML every time (the server and the browser agree)', () => {
    expect(referencePage(readme, diagrams).html).toBe(page.html)
  })
})

describe('the reference at the cursor', () => {
  const doc = 'system "x"\n\ncomponent H+ balance\n# a note\nreaction H2O <=> H+ + OH- pKw 14'
  const at = (text: string) => EditorState.create({ doc, selection: { anchor: doc.indexOf(text) + 1 } })

  it('opens the statement of the cursor line', () => {
    expect(statementAt(at('H+ balance'))).toBe('component')
    expect(referenceAt(at('H+ balance'))).toBe('/reference#component')
    expect(referenceAt(at('pKw'))).toBe('/reference#reaction')
  })

  it('opens the top of the reference on a blank line or a comment', () => {
    expect(referenceAt(EditorState.create({ doc, selection: { anchor: doc.indexOf('\n\n') + 1 } }))).toBe('/reference')
    expect(referenceAt(at('a note'))).toBe('/reference')
  })
})
