import { describe, expect, it } from 'vitest'
import { RUN_KEY, SAVE_KEY, shortcutLabel } from '../../../codemirror/shortcuts'

describe('shortcut labels', () => {
  it('names the run and save keys as each keyboard shows them', () => {
    expect(shortcutLabel(RUN_KEY, false)).toBe('Ctrl+Enter')
    expect(shortcutLabel(RUN_KEY, true)).toBe('⌘ Enter')
    expect(shortcutLabel(SAVE_KEY, false)).toBe('Ctrl+S')
  })
})
