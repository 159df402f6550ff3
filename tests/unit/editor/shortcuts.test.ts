import { describe, expect, it } from 'vitest'
import { matchesShortcut, RUN_KEY, SAVE_KEY, shortcutLabel } from '../../../codemirror/shortcuts'

describe('shortcut labels', () => {
  it('names the run and save keys as each keyboard shows them', () => {
    expect(shortcutLabel(RUN_KEY, false)).toBe('Ctrl+Enter')
    expect(shortcutLabel(RUN_KEY, true)).toBe('⌘ Enter')
    expect(shortcutLabel(SAVE_KEY, false)).toBe('Ctrl+S')
  })
})

describe('shortcut keys on the page', () => {
  const press = (key: string, mods: { ctrl?: boolean; meta?: boolean; alt?: boolean; shift?: boolean } = {}) =>
    ({ key, ctrlKey: Boolean(mods.ctrl), metaKey: Boolean(mods.meta), altKey: Boolean(mods.alt), shiftKey: Boolean(mods.shift) })

  it('takes Ctrl+Enter and Ctrl+S on other keyboards, ⌘ on Apple ones', () => {
    expect(matchesShortcut(press('Enter', { ctrl: true }), RUN_KEY, false)).toBe(true)
    expect(matchesShortcut(press('s', { ctrl: true }), SAVE_KEY, false)).toBe(true)
    expect(matchesShortcut(press('S', { ctrl: true }), SAVE_KEY, false)).toBe(true)
    expect(matchesShortcut(press('Enter', { meta: true }), RUN_KEY, true)).toBe(true)
    expect(matchesShortcut(press('s', { meta: true }), SAVE_KEY, true)).toBe(true)
  })

  it('leaves other keys alone: plain Enter, the other modifier, Shift or Alt added', () => {
    expect(matchesShortcut(press('Enter'), RUN_KEY, false)).toBe(false)
    expect(matchesShortcut(press('Enter', { meta: true }), RUN_KEY, false)).toBe(false)
    expect(matchesShortcut(press('Enter', { ctrl: true }), RUN_KEY, true)).toBe(false)
    expect(matchesShortcut(press('s', { ctrl: true, shift: true }), SAVE_KEY, false)).toBe(false)
    expect(matchesShortcut(press('s', { ctrl: true, alt: true }), SAVE_KEY, false)).toBe(false)
    expect(matchesShortcut(press('Enter', { ctrl: true }), SAVE_KEY, false)).toBe(false)
  })
})
