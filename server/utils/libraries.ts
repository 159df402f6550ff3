/**
 * Lab libraries: a system marked as a library can be imported by the other
 * systems of its lab with `use "slug"` (latest revision) or `use "slug" @ N`.
 * The compiler asks for libraries synchronously, so the revisions a source
 * names — and the ones those libraries name in turn — are loaded from the
 * database first, and the resolver answers from memory.
 */
import { and, asc, desc, eq, inArray, max, ne } from 'drizzle-orm'
import type { CompileOptions } from '../../shared/poise/index'
import { findUses } from '../../shared/poise/index'
import { tables, useDb } from './db'

type ResolveLibrary = NonNullable<CompileOptions['resolveLibrary']>

/** More distinct library revisions than any sane file needs; stops a pathological chain of uses. */
const MAX_LOADED_REVISIONS = 64

interface LoadedLibrary {
  latest: number
  sources: Map<number, string>
}

/**
 * Loads every library revision `source` reaches through `use` statements
 * (within `labId` only) and returns the compiler's resolver over them. A
 * missing library or revision resolves to null, so the compiler reports it
 * (P070 / P071) under the line that names it.
 */
export async function libraryResolverFor(labId: number, source: string): Promise<ResolveLibrary> {
  const db = useDb()
  const loaded = new Map<string, LoadedLibrary | null>()
  const wanted = findUses(source).map((u) => ({ name: u.name, revision: u.revision }))
  const seen = new Set<string>()
  let loads = 0
  while (wanted.length && loads < MAX_LOADED_REVISIONS) {
    const next = wanted.shift()!
    if (!loaded.has(next.name)) loaded.set(next.name, await loadLibraryHead(labId, next.name))
    const library = loaded.get(next.name)
    if (!library) continue
    const number = next.revision ?? library.latest
    const key = `${next.name}@${number}`
    if (seen.has(key)) continue
    seen.add(key)
    loads += 1
    let text = library.sources.get(number)
    if (text === undefined) {
      const [row] = await db.select({ source: tables.revisions.source }).from(tables.revisions)
        .innerJoin(tables.systems, eq(tables.systems.id, tables.revisions.systemId))
        .where(and(eq(tables.systems.labId, labId), eq(tables.systems.slug, next.name), eq(tables.revisions.number, number)))
      if (!row) continue
      text = row.source
      library.sources.set(number, text)
    }
    for (const use of findUses(text)) wanted.push({ name: use.name, revision: use.revision })
  }
  return (name, revision) => {
    const library = loaded.get(name)
    if (!library) return null
    const number = revision ?? library.latest
    const text = library.sources.get(number)
    return text === undefined ? null : { source: text, revision: number }
  }
}

/** The library system of the lab with that slug and its latest revision (with its text), or null. */
async function loadLibraryHead(labId: number, slug: string): Promise<LoadedLibrary | null> {
  const [row] = await useDb().select({ number: tables.revisions.number, source: tables.revisions.source })
    .from(tables.revisions)
    .innerJoin(tables.systems, eq(tables.systems.id, tables.revisions.systemId))
    .where(and(eq(tables.systems.labId, labId), eq(tables.systems.slug, slug), eq(tables.systems.isLibrary, true)))
    .orderBy(desc(tables.revisions.number))
    .limit(1)
  if (!row) return null
  return { latest: row.number, sources: new Map([[row.number, row.source]]) }
}

export interface LibraryUse {
  slug: string
  title: string
  /** The system's latest revision, whose text holds the `use`. */
  revision: number
  /** The revision it asks for, or null for "the latest". */
  pinned: number | null
  /** The library revision its newest run used, if it has run since. */
  lastRunUsed: number | null
}

/** The systems of the lab whose latest revision uses the library, with the revision they ask for. */
export async function systemsUsingLibrary(labId: number, librarySlug: string): Promise<LibraryUse[]> {
  const db = useDb()
  const heads = db.select({ systemId: tables.revisions.systemId, latest: max(tables.revisions.number).as('latest') })
    .from(tables.revisions).groupBy(tables.revisions.systemId).as('heads')
  const latest = await db.select({ id: tables.systems.id, slug: tables.systems.slug, title: tables.systems.title, number: tables.revisions.number, source: tables.revisions.source })
    .from(tables.systems)
    .innerJoin(heads, eq(heads.systemId, tables.systems.id))
    .innerJoin(tables.revisions, and(eq(tables.revisions.systemId, tables.systems.id), eq(tables.revisions.number, heads.latest)))
    .where(and(eq(tables.systems.labId, labId), ne(tables.systems.slug, librarySlug)))
    .orderBy(asc(tables.systems.title))
  const users = latest
    .map((row) => ({ row, use: findUses(row.source).find((u) => u.name === librarySlug) }))
    .filter((entry) => entry.use)
  if (!users.length) return []
  const newestRuns = db.select({ systemId: tables.revisions.systemId, runId: max(tables.runs.id).as('run_id') })
    .from(tables.runs)
    .innerJoin(tables.revisions, eq(tables.revisions.id, tables.runs.revisionId))
    .where(inArray(tables.revisions.systemId, users.map((u) => u.row.id)))
    .groupBy(tables.revisions.systemId).as('newest_runs')
  const runs = await db.select({ systemId: newestRuns.systemId, options: tables.runs.options })
    .from(newestRuns)
    .innerJoin(tables.runs, eq(tables.runs.id, newestRuns.runId))
  const lastRunUsed = new Map<number, number | null>()
  for (const run of runs) {
    const libraries = ((run.options ?? {}) as { libraries?: { name: string; revision: number }[] }).libraries ?? []
    lastRunUsed.set(run.systemId, libraries.find((l) => l.name === librarySlug)?.revision ?? null)
  }
  return users.map(({ row, use }) => ({
    slug: row.slug,
    title: row.title,
    revision: row.number,
    pinned: use!.revision,
    lastRunUsed: lastRunUsed.get(row.id) ?? null,
  }))
}
