/**
 * Lab libraries: a system marked as a library can be imported by the other
 * systems of its lab with `use "slug"` (latest revision) or `use "slug" @ N`.
 * Here: the resolver over the database, and who uses a library.
 */
import { and, asc, desc, eq, inArray, max, ne } from 'drizzle-orm'
import { findUses } from '../../shared/poise/index'
import { preloadLibraries, type LibraryText, type ResolveLibrary } from '../../shared/utils/library-preload'
import type { LibraryUse } from '../../shared/types/lab'
import { tables, useDb } from './db'

/**
 * The compiler's resolver for `source` in lab `labId`: every library revision
 * the text reaches is loaded first. A missing library or revision resolves to
 * null, so the compiler reports it (P070 / P071) under the line that names it.
 */
export function libraryResolverFor(labId: number, source: string): Promise<ResolveLibrary> {
  return preloadLibraries(source, (name, revision) => loadLibraryRevision(labId, name, revision))
}

/** A revision (the latest when null) of the library system with that slug in the lab, or null. */
async function loadLibraryRevision(labId: number, slug: string, revision: number | null): Promise<LibraryText | null> {
  const isThatLibrary = and(eq(tables.systems.labId, labId), eq(tables.systems.slug, slug), eq(tables.systems.isLibrary, true))
  const [row] = await useDb().select({ revision: tables.revisions.number, source: tables.revisions.source })
    .from(tables.revisions)
    .innerJoin(tables.systems, eq(tables.systems.id, tables.revisions.systemId))
    .where(revision === null ? isThatLibrary : and(isThatLibrary, eq(tables.revisions.number, revision)))
    .orderBy(desc(tables.revisions.number))
    .limit(1)
  return row ?? null
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
