/**
 * Compiled models kept between requests: a text is compiled again only when
 * it or one of the libraries it uses changed. The key is the SHA-256 of the
 * source; an entry also records every library lookup the compile made (name,
 * revision asked, revision and text hash got), and it is used only while the
 * caller's resolver still answers those lookups the same way — a new library
 * revision therefore compiles afresh. Bounded (least recently used first out).
 *
 * The answer is shared between requests, so it is frozen (deeply): a route
 * that tried to change a cached model would fail loudly instead of changing
 * the next request's model. Copying it per request instead would cost about
 * half a compile.
 */
import { createHash } from 'node:crypto'
import { LRUCache } from 'lru-cache'
import { compile, type CompileOptions, type CompileResult } from '../../shared/poise/index'

/** Texts kept; a 200-line model is ~0.3 MB as objects, so this bounds the cache at a few tens of MB. */
export const COMPILE_CACHE_ENTRIES = 100

interface Lookup { name: string, revision: number | null, got: { revision: number, hash: string } | null }
interface Entry { result: CompileResult, lookups: Lookup[] }

const cache = new LRUCache<string, Entry>({ max: COMPILE_CACHE_ENTRIES })

const hash = (text: string) => createHash('sha256').update(text).digest('base64')

/** What a resolver answers, reduced to what the cache compares. */
function answerOf(resolve: CompileOptions['resolveLibrary'], name: string, revision: number | null): Lookup['got'] {
  const found = resolve?.(name, revision) ?? null
  return found ? { revision: found.revision, hash: hash(found.source) } : null
}

/** `compile(source, options)`, answered from the cache when neither the text nor its libraries changed. */
export function compileCached(source: string, options: CompileOptions = {}): CompileResult {
  const key = hash(source)
  const hit = cache.get(key)
  if (hit && hit.lookups.every(l => sameAnswer(l.got, answerOf(options.resolveLibrary, l.name, l.revision)))) {
    return hit.result
  }
  const lookups: Lookup[] = []
  const resolveLibrary: CompileOptions['resolveLibrary'] = options.resolveLibrary
    ? (name, revision) => {
        const found = options.resolveLibrary!(name, revision)
        lookups.push({ name, revision, got: found ? { revision: found.revision, hash: hash(found.source) } : null })
        return found
      }
    : undefined
  const result = compile(source, { ...options, resolveLibrary })
  cache.set(key, { result: deepFreeze(result), lookups })
  return result
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value)
    for (const inner of Object.values(value)) deepFreeze(inner)
  }
  return value
}

function sameAnswer(a: Lookup['got'], b: Lookup['got']): boolean {
  return a === b || (a !== null && b !== null && a.revision === b.revision && a.hash === b.hash)
}

/** Empties the cache (tests). */
export function clearCompileCache(): void {
  cache.clear()
}
