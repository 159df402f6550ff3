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
