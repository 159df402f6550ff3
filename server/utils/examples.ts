/**
 * The example systems shipped in examples/ (Nitro server assets, so the built
 * server has them without the source tree): address, title (read by the
 * language, shared/poise/title.ts), the opening comment as a summary, and the
 * text. Read by the examples routes.
 */
import { z } from 'zod'
import type { ExampleView } from '../../shared/types/examples'
import { titleOf } from '../../shared/poise/title'

export const ExampleParams = z.object({ example: z.string().regex(/^[a-z0-9-]+$/, { error: 'Name an example by its address, e.g. copper-rinse-tank' }) })

function asText(raw: unknown): string {
  if (typeof raw === 'string') return raw
  if (raw instanceof Uint8Array) return new TextDecoder().decode(raw)
  return ''
}

function describe(slug: string, source: string): ExampleView {
  const title = titleOf(source) ?? slug
  const lines = source.split(/\r?\n/)
  const start = lines.findIndex((line) => line.trim().startsWith('#'))
  const comment: string[] = []
  for (let i = start; i >= 0 && i < lines.length && lines[i]!.trim().startsWith('#'); i++) {
    const text = lines[i]!.trim().replace(/^#\s?/, '')
    // The constants' provenance is for the file, not for choosing an example.
    if (/^constants\b/i.test(text)) break
    if (text) comment.push(text)
  }
  return { slug, title, summary: comment.length ? comment.join(' ') : outline(lines), source }
}

/** For a file whose opening comment is only provenance: its components and its sweep. */
function outline(lines: string[]): string {
  const components = lines.map((line) => /^\s*component\s+(\S+)/.exec(line)?.[1]).filter((name): name is string => Boolean(name))
  const sweep = lines.find((line) => /^\s*sweep\s/.test(line))?.trim()
  return [components.length ? `Components ${components.join(', ')}` : '', sweep ? `sweep: ${sweep.replace(/^sweep\s+/, '')}` : '']
    .filter(Boolean).join('; ')
}

export async function readExamples(): Promise<ExampleView[]> {
  const storage = useStorage('assets:examples')
  const keys = (await storage.getKeys()).filter((key) => key.endsWith('.poise')).sort()
  const examples: ExampleView[] = []
  for (const key of keys) {
    const source = asText(await storage.getItemRaw(key))
    if (source) examples.push(describe(key.replace(/\.poise$/, ''), source))
  }
  return examples
}
