import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import EditorDraftNotice from '../../../components/editor/EditorDraftNotice.vue'

describe('EditorDraftNotice', () => {
  it('says nothing when no draft was restored', () => {
    expect(mount(EditorDraftNotice, { props: { restoredAt: null } }).find('[data-testid="draft-notice"]').exists()).toBe(false)
  })

  it('tells the user unsaved changes came back and offers to discard them', async () => {
    const wrapper = mount(EditorDraftNotice, { props: { restoredAt: '2026-12-01T09:30:00Z' } })
    expect(wrapper.text()).toContain('Unsaved changes restored')
    await wrapper.get('[data-testid="draft-discard"]').trigger('click')
    await wrapper.get('[data-testid="draft-dismiss"]').trigger('click')
    expect(wrapper.emitted('discard')).toHaveLength(1)
    expect(wrapper.emitted('dismiss')).toHaveLength(1)
  })
})
