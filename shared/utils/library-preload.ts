/**
 * The compiler asks for `use`d libraries synchronously, but they live in the
 * database (server) or behind the API (browser). preloadLibraries walks the
 * `use` statements of a text — and of the libraries it reaches — loading each
 * named revision once, then answers the compiler from memory. The server
 * loads from MariaDB (server/utils/libraries.ts); the editor can load from
 * GET /api/labs/:lab/libraries/:name/revisions/:n.
 */
import { findUses, type CompileOptions } from '../poise/index'

export type ResolveLibrary = NonNullable<CompileOptions['resolveLibrary']>

export interface LibraryText {
  source: string
  revision: number
}

/** Loads revision `revision` of library `name` (its latest when null), or null when there is none. */
export type LoadLibrary = (name: string, revision: number | null) => Promise<LibraryText | null>

/** More distinct library revisions than any sane file needs; stops a pathological chain of uses. */
const MAX_LOADS = 64

export async function preloadLibraries(source: string, load: LoadLibrary): Promise<ResolveLibrary> {
  const found = new Map<string, LibraryText | null>()
  const keyOf = (name: string, revision: number | null) => `${name}@${revision ?? 'latest'}`
  const wanted = findUses(source).map(({ name, revision }) => ({ name, revision }))
  while (wanted.length && found.size < MAX_LOADS) {
    const { name, revision } = wanted.shift()!
    const key = keyOf(name, revision)
    if (found.has(key)) continue
    const text = await load(name, revision)
    found.set(key, text)
    if (text) wanted.push(...findUses(text.source).map((u) => ({ name: u.name, revision: u.revision })))
    // For "no revision 7", the compiler asks for the latest to name it in the message.
    else if (revision !== null) wanted.push({ name, revision: null })
  }
  return (name, revision) => found.get(keyOf(name, revision)) ?? null
}
