/**
 * The diagram choices a chemist makes for a system (which kind, which
 * component) are remembered per system in the browser's storage. Reading
 * tolerates anything a storage can hold: old, foreign or broken values fall
 * back to no preference rather than breaking the page.
 */

import { isDiagramKind, type DiagramKind } from './diagram'

export interface DiagramPrefs {
  kind?: DiagramKind
  component?: string
}

/** Storage key for one system's diagram choices. */
export function diagramPrefsKey(systemKey: string): string {
  return `equipoise:diagram:${systemKey}`
}

/** Parse stored preferences; anything unreadable gives `{}`. */
export function parseDiagramPrefs(raw: string | null): DiagramPrefs {
  if (!raw) return {}
  let value: unknown
  try {
    value = JSON.parse(raw)
  } catch {
    return {}
  }
  if (typeof value !== 'object' || value === null) return {}
  const record = value as Record<string, unknown>
  const prefs: DiagramPrefs = {}
  if (isDiagramKind(record.kind)) prefs.kind = record.kind
  if (typeof record.component === 'string' && record.component !== '') prefs.component = record.component
  return prefs
}

export function serializeDiagramPrefs(prefs: DiagramPrefs): string {
  return JSON.stringify({ kind: prefs.kind, component: prefs.component })
}
