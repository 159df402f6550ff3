/**
 * What the printable report shows: a stored run and the revision it solved.
 * `?run=ID` reports that run (with its own revision's text); `?revision=N`
 * the newest run of revision N; neither, the newest run of the latest
 * revision. The model printed is the one stored with the run; for a run
 * stored before models were, the text is recompiled with the library
 * revisions the run recorded (and the page says so).
 */
import type { GetJson, LibraryTexts } from './libraryTexts'
import type { RevisionView, RunListAnswer, RunView } from '../shared/types/system'
import { latestRunOf } from './picks'

export interface ReportChoice {
  run: number | null
  revision: number | null
}

function positiveWhole(value: unknown): number | null {
  const n = Number(Array.isArray(value) ? value[0] : value)
  return Number.isInteger(n) && n > 0 ? n : null
}

/** The run and revision a report address asks for; anything but a positive whole number counts as not given. */
export function reportChoice(query: Record<string, unknown>): ReportChoice {
  return { run: positiveWhole(query.run), revision: positiveWhole(query.revision) }
}

export interface ReportData {
  /** The revision number the report is of. */
  number: number
  /** Its text and author; null when the system has no such revision. */
  revision: RevisionView | null
  /** The run reported; null when that revision has no stored run (or the run asked for is not this system's). */
  run: RunView | null
  /** For a run stored before models were: the library texts its `use` lines reach, pinned to the revisions the run used. */
  libraries: LibraryTexts
}

/** Loads what the report of `choice` needs, given the system's latest revision. */
export async function loadReport(get: GetJson, lab: string, system: string, latest: RevisionView, choice: ReportChoice): Promise<ReportData> {
  const base = `/api/labs/${encodeURIComponent(lab)}/systems/${encodeURIComponent(system)}`
  let run: RunView | null = null
  let number = choice.revision ?? latest.number
  if (choice.run !== null) {
    run = await get<RunView>(`${base}/runs/${choice.run}`).catch(() => null)
    if (run) number = run.revision
  } else {
    const { runs } = await get<RunListAnswer>(`${base}/runs`)
    const newest = latestRunOf(runs, number)
    run = newest ? await get<RunView>(`${base}/runs/${newest.id}`).catch(() => null) : null
  }
  const revision = number === latest.number
    ? latest
    : await get<{ revision: RevisionView }>(`${base}/revisions/${number}`).then((a) => a.revision, () => null)
  // Only a run stored before models were needs the library texts: its model is rebuilt from its text.
  // The language and the library loader are loaded only then, so the report of a run with its model does not carry them.
  let libraries: LibraryTexts = {}
  if (revision && !run?.model) {
    const [{ findUses }, { labLibraryPreloader }] = await Promise.all([import('../shared/poise/index'), import('./libraryTexts')])
    if (findUses(revision.source).length) libraries = await labLibraryPreloader(lab, get)(revision.source, run?.libraries ?? []).catch(() => ({}))
  }
  return { number, revision, run, libraries }
}
