/**
 * What a page shows first, without the workbench store (so the printable
 * report does not load the store, the compiler and the editor's helpers):
 * the run of a revision, the component of the share column and diagram.
 * `stores/workbench.ts` re-exports these.
 */
import type { RunView } from '../shared/types/system'
import { distributableComponents, type StoichiometryModel } from '../shared/results/share'
import { diagramPrefsKey, parseDiagramPrefs } from '../shared/results/diagramPrefs'
import { browserStorage } from './storage'

/** The newest run of the given revision from a newest-first list, or null. */
export function latestRunOf(runs: RunView[], revision: number): RunView | null {
  return runs.find((run) => run.revision === revision) ?? null
}

/**
 * The component to share out first: the one held by the most species (the
 * phosphate of a sodium phosphate buffer, not its sodium); ties go to the
 * first declared.
 */
export function richestComponent(model: StoichiometryModel): string | null {
  let best: string | null = null
  let most = 0
  for (const name of distributableComponents(model)) {
    const j = model.components.findIndex((c) => c.name === name)
    const holders = model.species.filter((s) => (s.nu[j] ?? 0) > 0).length
    if (holders > most) {
      best = name
      most = holders
    }
  }
  return best
}

/** The component to show first: the one the diagram remembers for this system (browser only), else the richest. */
export function startingComponent(model: StoichiometryModel, systemKey: string): string | null {
  const remembered = browserStorage()?.getItem(diagramPrefsKey(systemKey))
  return (remembered === undefined ? undefined : parseDiagramPrefs(remembered).component) ?? richestComponent(model)
}

