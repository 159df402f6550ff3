/**
 * Unsaved work is never lost: the text being edited is kept as a draft in
 * localStorage, per system and per revision it was started from, restored
 * with a notice when the page opens again, and cleared on save. A guard
 * warns before the tab closes or the route changes with unsaved changes.
 */
import { computed, onBeforeUnmount, onMounted, ref, toValue, watch, type MaybeRefOrGetter, type Ref } from 'vue'
import { onBeforeRouteLeave } from 'vue-router'
import { browserStorage } from '../utils/storage'

export interface DraftKey {
  lab: string
  system: string
  /** The revision the edit started from; null for a system not saved yet. */
  baseRevision: number | null
}

export interface StoredDraft {
  source: string
  /** ISO time of the last change. */
  savedAt: string
}

/** The part of the Web Storage API drafts use, so tests can pass their own. */
export type DraftStorage = Pick<Storage, 'getItem' | 'setItem' | 'removeItem'>

export function draftStorageKey(key: DraftKey): string {
  return `equipoise:draft:${key.lab}/${key.system}@${key.baseRevision ?? 'new'}`
}

export function readDraft(storage: DraftStorage, key: DraftKey): StoredDraft | null {
  try {
    const raw = storage.getItem(draftStorageKey(key))
    if (!raw) return null
    const draft = JSON.parse(raw) as Partial<StoredDraft>
    return typeof draft.source === 'string' && typeof draft.savedAt === 'string' ? { source: draft.source, savedAt: draft.savedAt } : null
  } catch {
    // Unreadable storage or a damaged entry: there is no draft to restore.
    return null
  }
}

/** Keep `source` as the draft; false when the browser refused (storage full or disabled). */
export function writeDraft(storage: DraftStorage, key: DraftKey, source: string, now: Date = new Date()): boolean {
  try {
    storage.setItem(draftStorageKey(key), JSON.stringify({ source, savedAt: now.toISOString() } satisfies StoredDraft))
    return true
  } catch {
    return false
  }
}

export function clearDraft(storage: DraftStorage, key: DraftKey): void {
  try {
    storage.removeItem(draftStorageKey(key))
  } catch {
    // Nothing kept, nothing to clear.
  }
}


export interface UseDraftOptions {
  key: MaybeRefOrGetter<DraftKey>
  /** The text of the base revision (what a save would compare against). */
  saved: MaybeRefOrGetter<string>
  /** The text being edited (the editor's v-model). */
  source: Ref<string>
  storage?: DraftStorage | null
}

/**
 * Keeps `source` as a draft while it differs from `saved`. On mount a draft
 * left for the same system and base revision is put back into `source`, and
 * `restoredAt` says when it was written so the page can tell the user.
 */
export function useDraft(options: UseDraftOptions) {
  const restoredAt = ref<string | null>(null)
  /** False when the browser would not store the draft: then only the leave warning protects the work. */
  const keeping = ref(true)
  const dirty = computed(() => options.source.value !== toValue(options.saved))
  const storage = () => (options.storage === undefined ? browserStorage() : options.storage)

  function keep() {
    const store = storage()
    if (!store) return
    if (dirty.value) keeping.value = writeDraft(store, toValue(options.key), options.source.value)
    else clearDraft(store, toValue(options.key))
  }

  function restore() {
    const store = storage()
    const draft = store ? readDraft(store, toValue(options.key)) : null
    if (!draft || draft.source === toValue(options.saved)) return
    options.source.value = draft.source
    restoredAt.value = draft.savedAt
  }

  /** Throw the draft away and go back to the saved text. */
  function discard() {
    const store = storage()
    if (store) clearDraft(store, toValue(options.key))
    options.source.value = toValue(options.saved)
    restoredAt.value = null
  }

  /** After a successful save: the draft of the old base revision is no longer needed. */
  function markSaved(savedKey: DraftKey = toValue(options.key)) {
    const store = storage()
    if (store) clearDraft(store, savedKey)
    restoredAt.value = null
  }

  /** The user has seen the restore notice; the draft itself stays until save or discard. */
  function acknowledge() {
    restoredAt.value = null
  }

  onMounted(() => {
    restore()
    watch(options.source, keep)
  })

  return { dirty, restoredAt, keeping, discard, markSaved, acknowledge }
}

export const UNSAVED_CHANGES_MESSAGE = 'This system has unsaved changes. Leave anyway? (A draft stays in this browser.)'

/**
 * Warns before leaving with unsaved changes: the browser's own prompt when the
 * tab closes or reloads, and a confirm dialog when the route changes.
 */
export function useUnsavedChangesGuard(isDirty: () => boolean, message: string = UNSAVED_CHANGES_MESSAGE) {
  function onBeforeUnload(event: BeforeUnloadEvent) {
    if (!isDirty()) return
    event.preventDefault()
    // Older browsers only prompt when returnValue is set.
    event.returnValue = ''
  }
  onMounted(() => window.addEventListener('beforeunload', onBeforeUnload))
  onBeforeUnmount(() => window.removeEventListener('beforeunload', onBeforeUnload))
  onBeforeRouteLeave(() => !isDirty() || window.confirm(message))
}
