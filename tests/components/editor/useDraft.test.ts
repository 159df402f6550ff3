import { describe, expect, it, vi } from 'vitest'
import { defineComponent, h, nextTick, ref } from 'vue'
import { mount } from '@vue/test-utils'
import { draftStorageKey, readDraft, useDraft, writeDraft, type DraftStorage } from '../../../composables/useDraft'

vi.mock('vue-router', () => ({ onBeforeRouteLeave: () => {} }))

function memoryStorage(): DraftStorage {
  const items = new Map<string, string>()
  return { getItem: (k) => items.get(k) ?? null, setItem: (k, v) => void items.set(k, v), removeItem: (k) => void items.delete(k) }
}

const key = { lab: 'plating', system: 'rinse-tank', baseRevision: 2 }
const saved = 'system "Rinse tank"\n'

function mountWithDraft(storage: DraftStorage) {
  const source = ref(saved)
  let draft!: ReturnType<typeof useDraft>
  const wrapper = mount(
    defineComponent({
      setup() {
        draft = useDraft({ key, saved, source, storage })
        return () => h('div')
      },
    }),
  )
  return { source, draft, wrapper }
}

describe('useDraft', () => {
  it('restores a draft left for the same revision and says when it was written', async () => {
    const storage = memoryStorage()
    writeDraft(storage, key, saved + 'temperature 35 C\n', new Date('2026-12-01T09:30:00Z'))
    const { source, draft } = mountWithDraft(storage)
    await nextTick()
    expect(source.value).toBe(saved + 'temperature 35 C\n')
    expect(draft.restoredAt.value).toBe('2026-12-01T09:30:00.000Z')
    expect(draft.dirty.value).toBe(true)
    draft.acknowledge()
    expect(draft.restoredAt.value).toBeNull()
    expect(readDraft(storage, key)?.source).toBe(saved + 'temperature 35 C\n')
  })

  it('keeps each edit as the draft and drops it when the text is back to the saved one', async () => {
    const storage = memoryStorage()
    const { source } = mountWithDraft(storage)
    await nextTick()
    source.value = saved + 'activity davies\n'
    await nextTick()
    expect(readDraft(storage, key)?.source).toBe(saved + 'activity davies\n')
    source.value = saved
    await nextTick()
    expect(storage.getItem(draftStorageKey(key))).toBeNull()
  })

  it('discards the draft on request and clears it after a save', async () => {
    const storage = memoryStorage()
    writeDraft(storage, key, saved + '# more\n')
    const { source, draft } = mountWithDraft(storage)
    await nextTick()
    draft.discard()
    await nextTick()
    expect(source.value).toBe(saved)
    expect(readDraft(storage, key)).toBeNull()

    source.value = saved + '# again\n'
    await nextTick()
    draft.markSaved()
    expect(readDraft(storage, key)).toBeNull()
    expect(draft.restoredAt.value).toBeNull()
  })
})
