/**
 * Lab libraries for the compiler in the browser. The compiler asks for a
 * `use`d library synchronously, so the texts a system reaches are fetched
 * first (preloadLibraries walks the `use` lines) over
 * GET /api/labs/:lab/libraries (which revision is the latest) and
 * GET /api/labs/:lab/libraries/:name/revisions/:n (a revision's text).
 */
import { findUses } from '../shared/poise/index'
import { preloadLibraries, type LibraryText, type ResolveLibrary } from '../shared/utils/library-preload'

export type GetJson = <T>(url: string) => Promise<T>

/** The texts one preload found, by `name@revision` (`name@latest` for an unpinned use); null for none. */
export type LibraryTexts = Record<string, LibraryText | null>

/** The library revisions a run was solved with, so its report resolves `use "name"` as the run did. */
export type LibrariesUsed = { name: string; revision: number }[]

/** The `use` lines of a text as one string: preload again only when it changes. */
export function usesKey(source: string): string {
  return findUses(source).map((u) => `${u.name}@${u.revision ?? 'latest'}`).join('\n')
}

function keyOf(name: string, revision: number | null) {
  return `${name}@${revision ?? 'latest'}`
}

/** A synchronous resolver over texts preloaded earlier (e.g. carried in the page's payload). */
export function resolverFrom(texts: LibraryTexts): ResolveLibrary {
  return (name, revision) => texts[keyOf(name, revision)] ?? null
}

function isNotFound(error: unknown) {
  const e = error as { statusCode?: number; status?: number; response?: { status?: number } }
  return (e?.statusCode ?? e?.status ?? e?.response?.status) === 404
}

/**
 * A preloader for one lab. A revision's text never changes, so each is
 * fetched once per page; the latest revisions are asked again on each
 * preload. A library or revision that does not exist loads as null (the
 * compiler then says so under the `use` line); any other failure rejects, so
 * the caller keeps what it had.
 */
export function labLibraryPreloader(labSlug: string, get: GetJson) {
  const base = `/api/labs/${encodeURIComponent(labSlug)}/libraries`
  const revisions = new Map<string, Promise<LibraryText | null>>()

  function revisionText(name: string, n: number): Promise<LibraryText | null> {
    const key = keyOf(name, n)
    let text = revisions.get(key)
    if (!text) {
      text = get<{ source: string; revision: number }>(`${base}/${encodeURIComponent(name)}/revisions/${n}`).then(
        (answer) => ({ source: answer.source, revision: answer.revision }),
        (error) => {
          if (isNotFound(error)) return null
          revisions.delete(key)
          throw error
        },
      )
      revisions.set(key, text)
    }
    return text
  }

  /**
   * The texts `source` reaches. `pinned` (a stored run's libraries) answers
   * "the latest" with the revision that run used instead of today's latest.
   */
  return async function preload(source: string, pinned: LibrariesUsed = []): Promise<LibraryTexts> {
    let latest: Promise<Map<string, number>> | null = null
    const latestOf = async (name: string) => {
      const used = pinned.find((l) => l.name === name)
      if (used) return used.revision
      latest ??= get<{ libraries: { name: string; latestRevision: number }[] }>(base).then(
        (answer) => new Map(answer.libraries.map((l) => [l.name, l.latestRevision])),
      )
      return (await latest).get(name) ?? null
    }
    const texts: LibraryTexts = {}
    await preloadLibraries(source, async (name, revision) => {
      const n = revision ?? (await latestOf(name))
      const text = n === null ? null : await revisionText(name, n)
      texts[keyOf(name, revision)] = text
      return text
    })
    return texts
  }
}
