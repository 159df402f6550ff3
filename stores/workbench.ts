/**
 * The workbench of one system: the saved revision, the text being edited,
 * the run on show and what went wrong with the last save or run.
 *
 * A run is one of two things, and the page always says which:
 * - a stored run — the saved revision solved by the server and kept with it
 *   (POST …/runs); chosen when the text in the editor is the saved text;
 * - a preview — the text solved by POST /api/labs/:lab/solve (with the
 *   lab's libraries) and kept nowhere; chosen when there are unsaved edits,
 *   and always for a viewer (viewers do not store runs: RUN_STORE_ROLE).
 * Either way the tables and constants come from the model the server solved
 * (stored with the run), not from a recompile of the text; only a run stored
 * before models were is shown through a recompile, and the page says so.
 */
import { defineStore } from 'pinia'
import { computed, ref, shallowRef } from 'vue'
import { compile } from '../shared/poise/index'
import type { Diagnostic } from '../shared/poise/diagnostics'
import type { Model } from '../shared/poise/model'
import type { Answer, AnswerKind, MapAnswer, Result, SweepResult, TitrationResult } from '../shared/types/result'
import { mapCell } from '../shared/results/map-columns'
import type { PreviewAnswer, RevisionView, RunListAnswer, RunView, SystemAnswer } from '../shared/types/system'
import { jobIsActive } from '../shared/types/job'
import { titrationAsSweep } from '../shared/results/titration'
import { labRoleAtLeast } from '../shared/utils/roles'
import { RUN_STORE_ROLE } from '../shared/utils/run-rules'
import type { ResolveLibrary } from '../shared/utils/library-preload'
import { labLibraryPreloader, resolverFrom } from '../utils/libraryTexts'
import { latestRunOf } from '../utils/picks'
import { BINARY_ANSWER_TYPE, decodeBinaryAnswer } from '../shared/results/binary-answer'
import { sweepView, type SweepColumns } from '../shared/results/sweep-columns'

/** How often the workbench asks how far a queued or running run has got (polling: any web server can answer from the database, through any proxy). */
export const JOB_POLL_MS = 500

interface ShownBase {
  kind: AnswerKind
  /** The text that was solved, so the tables and diagrams use its model. */
  source: string
  /** For a sweep answered by columns, a view over them (`sweepView`: a point's Result is made when read). */
  result: Answer
  /** A sweep as the server sent it by columns (previews); absent for JSON answers. */
  columns?: SweepColumns
  /** The model the server solved; null for a run stored before models were (then recompiled from `source`). */
  model: Model | null
  solverVersion: string
  compilerVersion: string | null
  solverMs: number
  /** ISO time the answer arrived (stored runs: when the server made it). */
  at: string
}
/**
 * Why a preview was made: `unsaved` edits; a `viewer`'s Run (viewers store
 * nothing); or `opened`, the saved revision solved on opening because no run
 * of it is stored yet.
 */
export type PreviewReason = 'unsaved' | 'viewer' | 'opened'
/** A preview carries `ofRevision` when it solved the saved text of that revision. */
export type ShownRun =
  | (ShownBase & { origin: 'stored'; run: RunView })
  | (ShownBase & { origin: 'preview'; ofRevision: number | null; reason: PreviewReason })

/** A refusal from the server, in a shape the page can show. */
export interface ServerProblem {
  status: number
  message: string
  diagnostics: Diagnostic[]
}

/** A save refused because someone saved after the revision being edited. */
export interface SaveConflict {
  mine: string
  theirs: RevisionView
}

export type RunPlan = 'stored' | 'preview'

/** What a preview asks for: a sweep by columns (shared/results/binary-answer.ts), anything else as JSON. */
export const PREVIEW_ACCEPT = `${BINARY_ANSWER_TYPE}, application/json`

/**
 * A solve answer as it arrived: JSON (parsed by `$fetch`), or the binary
 * form (`$fetch` gives a Blob for a type it does not know), whose sweep by
 * columns is shown through `sweepView` and kept as `columns`.
 */
export async function previewAnswerFrom(reply: PreviewAnswer | Blob | ArrayBuffer): Promise<PreviewAnswer & { columns?: SweepColumns }> {
  if (!(reply instanceof Blob) && !(reply instanceof ArrayBuffer)) return reply
  // Thrown with `data.message`, so problemFrom shows these words.
  const unreadable = (why: string) => Object.assign(new Error(why), { data: { message: `The server answered in a form this page does not read (${why}). Reload the page.` } })
  let answer: Omit<PreviewAnswer, 'result'> & { result: SweepColumns }
  try {
    answer = decodeBinaryAnswer(reply instanceof Blob ? await reply.arrayBuffer() : reply)
  } catch (error) {
    throw unreadable((error as Error).message)
  }
  if (answer.result?.format !== 'sweep-columns') throw unreadable('not a sweep by columns')
  return { ...answer, result: sweepView(answer.result), columns: answer.result }
}

/** A stored run of the saved revision when the member may store runs and the text is unchanged; otherwise a preview. */
export function runPlan(canStore: boolean, canEdit: boolean, dirty: boolean): RunPlan {
  return canStore && !(canEdit && dirty) ? 'stored' : 'preview'
}

/** The status, message and diagnostics of an error thrown by `$fetch` (or anything else). */
export function problemFrom(error: unknown): ServerProblem {
  const e = error as { statusCode?: number; status?: number; response?: { status?: number }; data?: { message?: string; data?: { diagnostics?: Diagnostic[] } }; message?: string }
  const status = e?.statusCode ?? e?.status ?? e?.response?.status ?? 0
  const diagnostics = Array.isArray(e?.data?.data?.diagnostics) ? e.data!.data!.diagnostics! : []
  const message =
    e?.data?.message ??
    (status === 0 ? 'The server could not be reached. Check the connection and try again.' : `The server answered ${status}. Try again.`)
  return { status, message, diagnostics }
}

type Fetcher = <T>(url: string, options?: { method?: string; body?: unknown; headers?: Record<string, string> }) => Promise<T>

/** Nuxt's global `$fetch` (stubbed in component tests). */
function request<T>(url: string, options?: { method?: string; body?: unknown; headers?: Record<string, string> }): Promise<T> {
  const fetcher = (globalThis as unknown as { $fetch: Fetcher }).$fetch
  return fetcher<T>(url, options as never)
}

export const useWorkbenchStore = defineStore('workbench', () => {
  const answer = ref<SystemAnswer | null>(null)
  /** The text in the editor. */
  const source = ref('')
  /** The editor's latest diagnostics (the checker runs in the browser). */
  const diagnostics = shallowRef<Diagnostic[]>([])
  const shown = shallowRef<ShownRun | null>(null)
  /** Runs stored for this system exist, but none of the latest revision. */
  const olderRun = shallowRef<RunView | null>(null)
  /** For a sweep: which point the tables show. */
  const pointIndex = ref(0)
  const running = ref(false)
  /** The stored run being computed on the queue (queued or running), as last polled; null when none. */
  const job = shallowRef<RunView | null>(null)
  /** True from pressing Cancel until the job has stopped. */
  const cancelling = ref(false)
  const saving = ref(false)
  const runProblem = shallowRef<ServerProblem | null>(null)
  const saveProblem = shallowRef<ServerProblem | null>(null)
  const conflict = shallowRef<SaveConflict | null>(null)
  /** How the browser's compiler finds the lab libraries the text `use`s; undefined until they are loaded. */
  const resolveLibrary = shallowRef<ResolveLibrary | undefined>(undefined)
  /** True while the texts of the `use`d libraries are being fetched for the editor's checker. */
  const librariesLoading = ref(false)
  /** For a stored run: its libraries at the revisions it was solved with, so its constants are the ones it used. */
  const shownLibraries = shallowRef<ResolveLibrary | undefined>(undefined)
  let runTicket = 0
  let preloadTicket = 0
  let preloader: { lab: string; preload: ReturnType<typeof labLibraryPreloader> } | null = null

  const latest = computed(() => answer.value?.system.latest ?? null)
  const canEdit = computed(() => labRoleAtLeast(answer.value?.role, 'editor'))
  const canStore = computed(() => labRoleAtLeast(answer.value?.role, RUN_STORE_ROLE))
  const dirty = computed(() => latest.value !== null && source.value !== latest.value.source)
  const plan = computed<RunPlan>(() => runPlan(canStore.value, canEdit.value, dirty.value))
  const base = computed(() => (answer.value ? `/api/labs/${answer.value.lab.slug}/systems/${answer.value.system.slug}` : ''))
  const errorCount = computed(() => diagnostics.value.filter((d) => d.severity === 'error').length)
  /**
   * The model that was solved: species, stoichiometry, conditions and
   * constants for the results. The server's (stored with the run); for a run
   * stored before models were, today's compile of its text with the library
   * revisions it recorded (`shownModelRecompiled`).
   */
  const shownModel = computed<Model | null>(() => {
    if (!shown.value) return null
    if (shown.value.model) return shown.value.model
    const libraries = (shown.value.origin === 'stored' ? shownLibraries.value : undefined) ?? resolveLibrary.value
    return compile(shown.value.source, { resolveLibrary: libraries }).model
  })
  /** The shown run predates stored models: its tables use a recompile of its text, which may differ from what was solved. */
  const shownModelRecompiled = computed(() => shown.value !== null && shown.value.model === null)
  /** The shown answer no longer matches the editor's text. */
  const shownIsStale = computed(() => shown.value !== null && shown.value.source !== source.value)
  const sweep = computed<SweepResult | null>(() => (shown.value?.kind === 'sweep' ? (shown.value.result as SweepResult) : null))
  /** The map answer on show (its cells by columns); `pointIndex` is then the chosen cell, row after row. */
  const map = computed<MapAnswer | null>(() => (shown.value?.kind === 'map' ? (shown.value.result as MapAnswer) : null))
  /** The titration answer on show: its curve, or the dose to a target pH. */
  const titration = computed<TitrationResult | null>(() => (shown.value?.kind === 'titration' ? (shown.value.result as TitrationResult) : null))
  /** A titration curve as a sweep over the added volume, for the species diagrams. */
  const titrationSweep = computed<SweepResult | null>(() => (titration.value && 'points' in titration.value ? titrationAsSweep(titration.value) : null))
  /** The single result the tables show: the run's, or the chosen point of a sweep. */
  const pointResult = computed<Result | null>(() => {
    if (!shown.value) return null
    const t = titration.value
    if (t) {
      if (!('points' in t)) return t.point
      return t.points[Math.min(Math.max(pointIndex.value, 0), t.points.length - 1)] ?? null
    }
    const m = map.value
    if (m) {
      const nx = m.x.values.length
      const cells = nx * m.y.values.length
      if (cells === 0) return null
      const k = Math.min(Math.max(pointIndex.value, 0), cells - 1)
      return mapCell(m, Math.floor(k / nx), k % nx)
    }
    if (!sweep.value) return shown.value.result as Result
    const points = sweep.value.points
    return points[Math.min(Math.max(pointIndex.value, 0), points.length - 1)] ?? null
  })

  /** Take a freshly loaded system. The same system at the same revision keeps its state (SSR, then the browser). */
  function open(next: SystemAnswer) {
    const same =
      answer.value?.lab.slug === next.lab.slug &&
      answer.value.system.slug === next.system.slug &&
      answer.value.system.latest.number === next.system.latest.number
    answer.value = next
    if (same) return
    // Stop watching another system's job (it goes on on the queue).
    runTicket++
    job.value = null
    cancelling.value = false
    running.value = false
    source.value = next.system.latest.source
    diagnostics.value = []
    shown.value = null
    olderRun.value = null
    pointIndex.value = 0
    runProblem.value = null
    saveProblem.value = null
    conflict.value = null
    resolveLibrary.value = undefined
    shownLibraries.value = undefined
  }

  function showStored(run: RunView, solvedSource: string) {
    if (!run.result) {
      if (run.jobStatus === 'cancelled') runProblem.value = { status: 0, message: `Run ${run.number} was cancelled before any point was computed; nothing was kept.`, diagnostics: [] }
      if (run.jobStatus === 'failed') runProblem.value = { status: 0, message: run.jobError ?? `Run ${run.number} failed.`, diagnostics: [] }
      return
    }
    shown.value = {
      origin: 'stored',
      run,
      kind: run.kind,
      source: solvedSource,
      result: run.result,
      model: run.model ?? null,
      solverVersion: run.solverVersion,
      compilerVersion: run.compilerVersion ?? null,
      solverMs: run.timingMs,
      at: run.createdAt,
    }
    olderRun.value = null
    shownLibraries.value = undefined
    if (!run.model && run.libraries?.length) void pinLibraries(run, solvedSource)
  }

  function libraryPreloader(lab: string) {
    if (preloader?.lab !== lab) preloader = { lab, preload: labLibraryPreloader(lab, request) }
    return preloader.preload
  }

  /** For a run stored before models were: load the library revisions it used; until then (or if that fails) the editor's libraries stand in. */
  async function pinLibraries(run: RunView, solvedSource: string) {
    const lab = answer.value?.lab.slug
    if (!lab) return
    try {
      const texts = await libraryPreloader(lab)(solvedSource, run.libraries)
      if (shown.value?.origin === 'stored' && shown.value.run.id === run.id) shownLibraries.value = resolverFrom(texts)
    } catch {
      // The editor's libraries stand in.
    }
  }

  /**
   * On opening, results at once: the newest stored run of the latest
   * revision, or when there is none a preview of the saved text (stored
   * nowhere, and labelled so).
   */
  async function loadLastRun() {
    const saved = latest.value
    if (!saved || shown.value) return
    let mine: RunView | null = null
    try {
      const { runs } = await request<RunListAnswer>(`${base.value}/runs`)
      mine = latestRunOf(runs, saved.number)
      if (!mine) olderRun.value = runs[0] ?? null
      else if (jobIsActive(mine.jobStatus)) {
        // Still on the queue (started before the page was left): show its progress and the answer when it ends.
        if (running.value) return
        const ticket = ++runTicket
        running.value = true
        try {
          await followJob(mine, saved.source, ticket)
        } finally {
          if (ticket === runTicket) running.value = false
        }
        return
      } else {
        const full = await request<RunView>(`${base.value}/runs/${mine.id}`)
        if (latest.value?.number === saved.number && !shown.value) showStored(full, saved.source)
        return
      }
    } catch (error) {
      runProblem.value = problemFrom(error)
      return
    }
    if (latest.value?.number === saved.number && !shown.value && !running.value) await run('preview', true)
  }

  /** Polls a queued or running job until it ends, keeping `job` current; then shows what it stored. */
  async function followJob(started: RunView, solvedSource: string, ticket: number) {
    let current = started
    job.value = current
    while (jobIsActive(current.jobStatus)) {
      await new Promise((r) => setTimeout(r, JOB_POLL_MS))
      if (ticket !== runTicket) return
      current = await request<RunView>(`${base.value}/runs/${started.id}`)
      if (ticket !== runTicket) return
      job.value = current
    }
    job.value = null
    cancelling.value = false
    showStored(current, solvedSource)
  }

  /** Asks the server to stop the job on show; it keeps the points computed so far. */
  async function cancel() {
    const current = job.value
    if (!current || cancelling.value) return
    cancelling.value = true
    try {
      await request(`${base.value}/runs/${current.id}/cancel`, { method: 'POST' })
    } catch (error) {
      const problem = problemFrom(error)
      // 409: it ended meanwhile; the poll shows how.
      if (problem.status !== 409) {
        runProblem.value = problem
        cancelling.value = false
      }
    }
  }

  /**
   * Solve: a stored run or a preview as `plan` says (or as asked). `opening`
   * marks the preview made on opening a system with no stored run.
   */
  async function run(how: RunPlan = plan.value, opening = false) {
    const saved = latest.value
    if (!saved) return
    const ticket = ++runTicket
    const text = how === 'stored' || opening ? saved.source : source.value
    running.value = true
    runProblem.value = null
    try {
      if (how === 'stored') {
        const queued = await request<RunView>(`${base.value}/runs`, { method: 'POST', body: { revision: saved.number } })
        if (ticket === runTicket) await followJob(queued, text, ticket)
      } else {
        const reply = await request<PreviewAnswer | Blob>(`/api/labs/${answer.value!.lab.slug}/solve`, { method: 'POST', body: { source: text }, headers: { accept: PREVIEW_ACCEPT } })
        const preview = await previewAnswerFrom(reply)
        if (ticket === runTicket) {
          shown.value = {
            origin: 'preview',
            ofRevision: text === saved.source ? saved.number : null,
            reason: opening ? 'opened' : text === saved.source ? 'viewer' : 'unsaved',
            kind: preview.kind,
            source: text,
            result: preview.result,
            ...(preview.columns ? { columns: preview.columns } : {}),
            model: preview.model ?? null,
            solverVersion: preview.solverVersion,
            compilerVersion: preview.compilerVersion ?? null,
            solverMs: preview.elapsedMs,
            at: new Date().toISOString(),
          }
        }
      }
      if (ticket === runTicket) pointIndex.value = Math.min(pointIndex.value, (sweep.value?.points.length ?? (map.value ? map.value.x.values.length * map.value.y.values.length : null) ?? (titration.value && 'points' in titration.value ? titration.value.points.length : 1)) - 1)
    } catch (error) {
      if (ticket === runTicket) runProblem.value = problemFrom(error)
    } finally {
      if (ticket === runTicket) running.value = false
    }
  }

  /**
   * Load the libraries the editor's text reaches, for the compiler in the
   * browser. Call again when its `use` lines change; the last call wins. A
   * failed load keeps the previous resolver (the next change tries again).
   */
  async function loadLibraries() {
    const lab = answer.value?.lab.slug
    if (!lab) return
    const ticket = ++preloadTicket
    librariesLoading.value = true
    try {
      const texts = await libraryPreloader(lab)(source.value)
      if (ticket === preloadTicket) resolveLibrary.value = resolverFrom(texts)
    } catch {
      // Keep what we had: the server still resolves libraries on run and save.
    } finally {
      if (ticket === preloadTicket) librariesLoading.value = false
    }
  }

  /** The revision number the save started from, so the page can drop that draft; null when nothing was saved. */
  async function save(message: string, baseRevision: number | undefined = latest.value?.number): Promise<number | null> {
    const current = answer.value
    if (!current || baseRevision === undefined || saving.value) return null
    const text = source.value
    saving.value = true
    saveProblem.value = null
    try {
      const saved = await request<{ system: SystemAnswer['system'] }>(base.value, {
        method: 'PATCH',
        body: { source: text, message: message.trim() || undefined, baseRevision },
      })
      answer.value = { ...current, system: saved.system }
      conflict.value = null
      // A preview of exactly this text is now the saved revision's text, but it was still not stored.
      return baseRevision
    } catch (error) {
      const problem = problemFrom(error)
      if (problem.status === 409) {
        try {
          const fresh = await request<SystemAnswer>(base.value)
          conflict.value = { mine: text, theirs: fresh.system.latest }
        } catch (reload) {
          saveProblem.value = problemFrom(reload)
        }
      } else {
        saveProblem.value = problem
      }
      return null
    } finally {
      saving.value = false
    }
  }

  /** Save my text on top of the revision that won, after seeing both. */
  function keepMine(message: string): Promise<number | null> {
    const theirs = conflict.value?.theirs
    if (!theirs || !answer.value) return Promise.resolve(null)
    return save(message, theirs.number)
  }

  /** Drop my text and continue from the revision that won. */
  function takeTheirs() {
    const current = answer.value
    const theirs = conflict.value?.theirs
    if (!current || !theirs) return
    answer.value = { ...current, system: { ...current.system, latest: theirs } }
    source.value = theirs.source
    conflict.value = null
    shown.value = null
  }

  return {
    answer, source, diagnostics, shown, olderRun, titration, titrationSweep, map, pointIndex, running, job, cancelling, saving, runProblem, saveProblem, conflict, resolveLibrary, librariesLoading,
    latest, canEdit, canStore, dirty, plan, errorCount, shownModel, shownModelRecompiled, shownIsStale, sweep, pointResult,
    open, loadLastRun, loadLibraries, run, cancel, save, keepMine, takeTheirs,
  }
})
