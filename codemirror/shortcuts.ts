/**
 * The workbench's own keys, in CodeMirror's key notation, and how to show
 * them: Run is Ctrl-Enter (⌘-Enter on Apple keyboards), Save is Ctrl-S, the
 * language reference at the cursor's statement is F1.
 */
export const RUN_KEY = 'Mod-Enter'
export const SAVE_KEY = 'Mod-s'
/** Opens the language reference at the statement on the cursor's line (codemirror/reference.ts). */
export const REFERENCE_KEY = 'F1'

/** True on macOS and iOS, where CodeMirror's `Mod` is the Command key. */
export function isApplePlatform(): boolean {
  return typeof navigator !== 'undefined' && /Mac|iPhone|iPad|iPod/.test(navigator.platform || navigator.userAgent)
}

/** `Mod-Enter` → `Ctrl+Enter`, or `⌘ Enter` on Apple keyboards. */
export function shortcutLabel(key: string, apple: boolean = isApplePlatform()): string {
  return key
    .split('-')
    .map((part) => (part === 'Mod' ? (apple ? '⌘' : 'Ctrl') : part.length === 1 ? part.toUpperCase() : part))
    .join(apple ? ' ' : '+')
}

/**
 * True when a key press is one of the keys above (`Mod-Enter`, `Mod-s`): Ctrl,
 * or ⌘ on Apple keyboards, with no other modifier, so the page can answer
 * them outside the editor too (the note field, a button, the results).
 */
export function matchesShortcut(event: Pick<KeyboardEvent, 'key' | 'ctrlKey' | 'metaKey' | 'altKey' | 'shiftKey'>, key: string, apple: boolean = isApplePlatform()): boolean {
  const [modifier, name] = key.split('-')
  if (modifier !== 'Mod' || !name || event.altKey || event.shiftKey) return false
  const mod = apple ? event.metaKey && !event.ctrlKey : event.ctrlKey && !event.metaKey
  return mod && event.key.toLowerCase() === name.toLowerCase()
}
