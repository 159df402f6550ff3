/**
 * The answers of the system, revision and run routes, as the server builds
 * them and the workbench, history, report page and CLI read them. Defined
 * once here; `server/openapi/answers.ts` checks its JSON Schemas against them.
 */
import type { Diagnostic } from '../poise/diagnostics'
import type { Model } from '../poise/model'
import type { LabRole } from '../utils/roles'
import type { Answer, AnswerKind } from './result'
import type { ReviewState } from './review'
import type { JobProgress, JobStatus } from './job'

/** A saved revision with its text (GET …/systems/:system's `latest`, GET …/revisions/:n's `revision`). */
export interface RevisionView {
  number: number
  sha256: string
  source: string
  message: string
  author: string | null
  createdAt: string
}

/** GET /api/labs/:lab/systems/:system */
export interface SystemAnswer {
  lab: { slug: string; name: string }
  role: LabRole
  system: { slug: string; title: string; isLibrary: boolean; latest: RevisionView }
}

export type RunStatus = 'ok' | 'failed' | 'diverged'

/** A stored run as the runs routes return it (`result` and `model` only from the single-run routes and POST …/runs). */
export interface RunView {
  /** The run's key in URLs (`…/runs/:id`, the report's `?run=`). */
  id: number
  /** The run's number within its system (1, 2, 3 …), the one a person reads. */
  number: number
  revision: number
  /** How the solve came out; null until the job is done (and for a job cancelled before its first point). */
  status: RunStatus | null
  kind: AnswerKind
  solverVersion: string
  /** The compiler version that made the stored model; null for a run stored before models were. */
  compilerVersion: string | null
  /** False for a run stored before models were: it can only be shown through a recompile of its text. */
  storedModel: boolean
  /** Bytes it takes in the lab's run storage budget. */
  storedBytes: number
  timingMs: number
  createdAt: string
  createdBy: string | null
  failedPoints: number
  /** The library revisions the run was solved with. */
  libraries: { name: string; revision: number }[]
  /** The run as a job on the study queue (server/jobs/): queued → running → done | failed | cancelled. */
  jobStatus: JobStatus
  /** The queue's id of the job; null for a run stored before runs were jobs. */
  jobId: string | null
  queuedAt: string | null
  startedAt: string | null
  finishedAt: string | null
  /** The worker (host:pid) that last took the job up. */
  worker: string | null
  progress: JobProgress
  /** Why the job failed, in words; null unless it failed. */
  jobError: string | null
  /** The answer (single-run routes only); null until the job ends; a cancelled sweep's holds the points it computed. */
  result?: Answer | null
  /** The model that was solved (single-run routes only); null for a run stored before models were. */
  model?: Model | null
}

/** The lab's run storage, from GET …/runs. */
export interface RunStorage {
  usedBytes: number
  budgetBytes: number
}

/** GET …/systems/:system/runs */
export interface RunListAnswer {
  runs: RunView[]
  storage: RunStorage
}

/** POST /api/labs/:lab/solve and POST /api/solve: a preview, stored nowhere. */
export interface PreviewAnswer {
  kind: AnswerKind
  solverVersion: string
  compilerVersion: string
  elapsedMs: number
  diagnostics: Diagnostic[]
  /** The library revisions the model used. */
  libraries: { name: string; revision: number }[]
  result: Answer
  /** The model that was solved. */
  model: Model
}

/** One revision in GET …/systems/:system/revisions. */
export interface RevisionSummary {
  number: number
  parent: number | null
  sha256: string
  message: string
  author: string | null
  createdAt: string
  /** The newest run of this revision, or null when it was never solved. */
  run: { id: number; number: number; status: RunStatus | null; jobStatus: JobStatus; solverVersion: string; createdAt: string } | null
  /** Reviews of this revision (as the newer side), newest first. */
  reviews: { id: number; state: ReviewState; against: number; reviewer: string | null }[]
}

/** GET …/systems/:system/revisions */
export interface RevisionListAnswer {
  lab: { slug: string; name: string }
  system: { slug: string; title: string }
  role: LabRole
  revisions: RevisionSummary[]
}

/** GET /api/labs/:lab/systems: the lab's systems by title, with their latest revision. */
export interface SystemListAnswer {
  systems: { slug: string; title: string; isLibrary: boolean; latestRevision: number | null; updatedAt: string | null }[]
}

/** GET /api/labs: the labs I am a member of, with my role. */
export interface LabListAnswer {
  labs: { slug: string; name: string; role: LabRole }[]
}

/** GET …/systems/:system/revisions/:number */
export interface RevisionAnswer {
  revision: RevisionView & { parent: number | null }
  latestRevision: number
}
