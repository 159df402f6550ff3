/**
 * The title of a system, as the language reads it: the `system "TITLE"`
 * statement, parsed (escapes and all) — the one place the upload, the
 * examples, the seed and the new-system page get a title from a text or put
 * one into it.
 */
import { parseFile } from './statements'

function systemStatement(source: string) {
  const found = parseFile(source).statements.find((s) => s.kind === 'system')
  return found?.kind === 'system' ? found : null
}

/** The title the text gives itself on its `system` line, or null when it has none (or an empty one). */
export function titleOf(source: string): string | null {
  return systemStatement(source)?.title.trim() || null
}

/** A title as Poise quoted text: `"` and `\` escaped, line breaks made spaces (a text holds one line). */
export function quoteTitle(title: string): string {
  return `"${title.replace(/[\r\n]+/g, ' ').trim().replace(/[\\"]/g, '\\$&')}"`
}

/** The text under another title: its `system` line's title replaced, or a `system` line put first when it has none. */
export function withTitle(source: string, title: string): string {
  const statement = systemStatement(source)
  if (!statement) return `system ${quoteTitle(title)}\n${source}`
  return source.slice(0, statement.titleTok.from) + quoteTitle(title) + source.slice(statement.titleTok.to)
}
