import { describe, expect, it } from 'vitest'
import { clearDraft, draftStorageKey, readDraft, writeDraft, type DraftStorage } from '../../../composables/useDraft'

function memoryStorage(): DraftStorage & { items: Map<string, string> } {
  const items = new Map<string, string>()
  return {
    items,
    getItem: (k) => items.get(k) ?? null,
    setItem: (k, v) => void items.set(k, v),
    removeItem: (k) => void items.delete(k),
  }
}

const rinseTank = { lab: 'plating', system: 'rinse-tank', baseRevision: 3 }

describe('drafts in browser storage', () => {
  it('keeps a draft per system and base revision', () => {
    const storage = memoryStorage()
    writeDraft(storage, rinseTank, 'system "Rinse tank"', new Date('2026-12-01T10:00:00Z'))
    expect(readDraft(storage, rinseTank)).toEqual({ source: 'system "Rinse tank"', savedAt: '2026-12-01T10:00:00.000Z' })
    expect(readDraft(storage, { ...rinseTank, baseRevision: 4 })).toBeNull()
    expect(readDraft(storage, { ...rinseTank, system: 'limestone-bed' })).toBeNull()
  })

  it('names a draft of a system never saved apart from its revisions', () => {
    expect(draftStorageKey({ lab: 'plating', system: 'bath', baseRevision: null })).toBe('equipoise:draft:plating/bath@new')
    expect(draftStorageKey({ lab: 'plating', system: 'bath', baseRevision: 1 })).toBe('equipoise:draft:plating/bath@1')
  })

  it('clears the draft', () => {
    const storage = memoryStorage()
    writeDraft(storage, rinseTank, 'x')
    clearDraft(storage, rinseTank)
    expect(readDraft(storage, rinseTank)).toBeNull()
  })

  it('treats a damaged entry as no draft', () => {
    const storage = memoryStorage()
    storage.setItem(draftStorageKey(rinseTank), '{not json')
    expect(readDraft(storage, rinseTank)).toBeNull()
    storage.setItem(draftStorageKey(rinseTank), JSON.stringify({ source: 42 }))
    expect(readDraft(storage, rinseTank)).toBeNull()
  })

  it('reports when the browser refuses to store the draft', () => {
    const full: DraftStorage = {
      getItem: () => null,
      setItem: () => {
        throw new Error('QuotaExceededError')
      },
      removeItem: () => {},
    }
    expect(writeDraft(full, rinseTank, 'x')).toBe(false)
  })
})
