/**
 * The language reference as a page of the app: grammar/README.md (the one
 * text of the reference) rendered with markdown-it, with the static syntax
 * diagram of each statement (grammar/diagrams.json, generated from the
 * parser) under its heading, and the building blocks (quantity, term, …)
 * at the end. Every statement keyword is an anchor (`/reference#component`),
 * which the editor's "reference" key and link open.
 */
import MarkdownIt from 'markdown-it'

export interface DiagramsFile {
  rules: { rule: string; keyword: string | null; svg: string }[]
}


/** A heading's anchor: lower-case words joined by dashes. */
export function slug(text: string): string {
  return text.toLowerCase().replace(/`/g, '').replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'section'
}

/** The statement keywords a heading introduces: the first word of each code span (`sample volume …`, `titrant …` → sample, titrant). */
export function headingKeywords(content: string, statementKeywords: ReadonlySet<string>): string[] {
  const words = [...content.matchAll(/`([^`]+)`/g)].map((m) => m[1]!.trim().split(/\s+/)[0]!)
  return [...new Set(words.filter((w) => statementKeywords.has(w)))]
}

const escapeHtml = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;')

/** Links of the README that point into the repository, as addresses of the app. */
const LINKS: Record<string, string> = {
  'diagrams.html': '#syntax-diagrams',
  '../examples': '/examples',
}

export interface ReferencePage {
  html: string
  /** The sections for a table of contents: level-2 headings and the statements. */
  contents: { id: string; title: string; level: number }[]
}

/** The reference page from the README's text and the diagrams file. The same input always gives the same HTML (server and browser agree). */
export function referencePage(readme: string, diagrams: DiagramsFile): ReferencePage {
  const md = new MarkdownIt({ html: true, linkify: false, typographer: false })
  const statementKeywords = new Set(diagrams.rules.map((r) => r.keyword).filter((k): k is string => k !== null))
  const diagramOf = new Map(diagrams.rules.filter((r) => r.keyword).map((r) => [r.keyword!, r]))
  const contents: ReferencePage['contents'] = []
  const used = new Set<string>()
  const unique = (id: string) => {
    let out = id
    for (let n = 2; used.has(out); n++) out = `${id}-${n}`
    used.add(out)
    return out
  }
  // Keywords claimed as anchors, so each keyword is the id of one heading only (its statement's).
  const claimed = new Set<string>()

  md.renderer.rules.heading_open = (tokens, idx, options, _env, self) => {
    const token = tokens[idx]!
    const content = tokens[idx + 1]?.content ?? ''
    const level = Number(token.tag.slice(1))
    const keywords = level === 3 ? headingKeywords(content, statementKeywords).filter((k) => !claimed.has(k)) : []
    keywords.forEach((k) => claimed.add(k))
    const id = unique(keywords[0] ?? slug(content))
    token.attrSet('id', id)
    if (level === 2 || (level === 3 && keywords.length)) contents.push({ id, title: content.replace(/`/g, ''), level })
    // Other keywords of the same heading get their own anchors (`#titrant`, `#titrate`).
    const extra = keywords.slice(1).map((k) => `<span id="${escapeHtml(unique(k))}"></span>`).join('')
    token.meta = { keywords }
    return extra + self.renderToken(tokens, idx, options)
  }
  md.renderer.rules.heading_close = (tokens, idx, options, _env, self) => {
    const open = tokens[idx - 2]
    const keywords = (open?.meta as { keywords?: string[] } | null)?.keywords ?? []
    const figures = keywords
      .map((k) => diagramOf.get(k))
      .filter((r): r is NonNullable<typeof r> => r !== undefined)
      .map((r) => `<figure class="reference-diagram" aria-label="syntax of ${escapeHtml(r.keyword!)}">${r.svg}</figure>`)
      .join('')
    return self.renderToken(tokens, idx, options) + figures
  }
  md.renderer.rules.link_open = (tokens, idx, options, _env, self) => {
    const token = tokens[idx]!
    const href = token.attrGet('href') ?? ''
    if (LINKS[href]) token.attrSet('href', LINKS[href])
    return self.renderToken(tokens, idx, options)
  }
  md.renderer.rules.table_open = () => '<div class="reference-table"><table>'
  md.renderer.rules.table_close = () => '</table></div>'

  const blocks = diagrams.rules.filter((r) => r.keyword === null)
  const appendix = [
    '',
    '## Syntax diagrams',
    '',
    'Each statement above shows its diagram under its heading; these are the parts they share and the whole `statement` rule. Read a diagram from left to right: a rounded box is a word or token as written, a square box is another diagram of this list.',
    '',
    ...blocks.map((r) => `### ${r.rule}\n\n<figure class="reference-diagram" aria-label="syntax of ${r.rule}">${r.svg}</figure>\n`),
  ].join('\n')
  const html = md.render(readme.replace(/<!-- [a-z-]+:(?:begin|end)[^>]*-->/g, '') + appendix)
  return { html, contents }
}
