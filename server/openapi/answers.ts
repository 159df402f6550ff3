/**
 * JSON Schemas of the answers the command line and scripts rely on most
 * (revisions, systems, runs, labs, the signed-in user). Each is checked
 * against the TypeScript type the route returns, so `nuxt typecheck` fails
 * when a route's answer changes and its description does not.
 */
import { z } from 'zod'
import type { LabListAnswer as LabList, RevisionAnswer as RevisionWithLatest, RevisionListAnswer as RevisionList, RevisionSummary, RevisionView, RunStorage, RunView, SystemAnswer as SystemView, SystemListAnswer as SystemList } from '../../shared/types/system'
import { LAB_ROLES } from '../../shared/utils/roles'
import { REVIEW_STATES } from '../../shared/types/review'
import { JOB_STATUSES } from '../../shared/types/job'

type IsAny<T> = 0 extends 1 & T ? true : false
/** True when some property of T is `any` (or T is): such a type would match any schema. */
type HasAny<T> = IsAny<T> extends true ? true : true extends { [K in keyof T]-?: IsAny<T[K]> }[keyof T] ? true : false
/** True only when A and B are the same type, and B has no `any` in its properties. */
type Same<A, B> = HasAny<B> extends true ? false : [A] extends [B] ? ([B] extends [A] ? true : false) : false

const RUN_STATUSES = ['ok', 'failed', 'diverged'] as const
const datetime = z.iso.datetime()

export const RevisionAnswer = z.object({
  number: z.int(),
  sha256: z.string(),
  source: z.string().meta({ description: 'The Poise text of the revision' }),
  message: z.string(),
  author: z.string().nullable(),
  createdAt: datetime,
})
const revisionChecked: Same<z.infer<typeof RevisionAnswer>, RevisionView> = true

export const RevisionSummaryAnswer = z.object({
  number: z.int(),
  parent: z.int().nullable(),
  sha256: z.string(),
  message: z.string(),
  author: z.string().nullable(),
  createdAt: datetime,
  run: z.object({ id: z.int(), number: z.int(), status: z.enum(RUN_STATUSES).nullable(), jobStatus: z.enum(JOB_STATUSES), solverVersion: z.string(), createdAt: datetime }).nullable()
    .meta({ description: 'The newest run of this revision, or null' }),
  reviews: z.array(z.object({ id: z.int(), state: z.enum(REVIEW_STATES), against: z.int(), reviewer: z.string().nullable() })),
})
const summaryChecked: Same<z.infer<typeof RevisionSummaryAnswer>, RevisionSummary> = true

export const JobProgressAnswer = z.object({
  done: z.int().meta({ description: 'Points computed so far (never decreasing)' }),
  total: z.int().meta({ description: 'Points the run computes (1 for a single solve)' }),
  elapsedMs: z.int().meta({ description: 'Milliseconds since a worker started it (to its end once ended); 0 while queued' }),
  remainingMs: z.int().nullable().meta({ description: 'Estimated milliseconds left at the rate so far; null while nothing is done or once it ended' }),
  unit: z.enum(['points', 'draws']).optional().meta({ description: 'What done and total count: the study\'s points when absent; "draws" for a Monte Carlo run (uncertainty draws N), whose study is solved once more at the end' }),
})

export const RunAnswer = z.object({
  id: z.int().meta({ description: 'The run\'s key in URLs (…/runs/:id, the report\'s ?run=)' }),
  number: z.int().meta({ description: 'The run\'s number within its system: 1 for the system\'s first run' }),
  revision: z.int(),
  status: z.enum(RUN_STATUSES).nullable().meta({ description: 'How the solve came out; null until the job is done (and for a job cancelled before its first point)' }),
  kind: z.enum(['single', 'sweep', 'titration', 'map']),
  solverVersion: z.string(),
  compilerVersion: z.string().nullable().meta({ description: 'The compiler version that made the stored model; null for a run stored before models were' }),
  storedModel: z.boolean().meta({ description: 'False for a run stored before models were: it has no `model`' }),
  storedBytes: z.int().meta({ description: 'Bytes the run takes in the lab\'s run storage budget' }),
  timingMs: z.int(),
  createdAt: datetime,
  createdBy: z.string().nullable(),
  failedPoints: z.int(),
  libraries: z.array(z.object({ name: z.string(), revision: z.int() })).meta({ description: 'The library revisions the run used' }),
  jobStatus: z.enum(JOB_STATUSES).meta({ description: 'The run as a job on the study queue: queued → running → done, failed or cancelled (a cancelled run keeps the points it computed)' }),
  jobId: z.string().nullable().meta({ description: 'The queue\'s id of the job; null for a run stored before runs were jobs' }),
  queuedAt: datetime.nullable(),
  startedAt: datetime.nullable(),
  finishedAt: datetime.nullable(),
  worker: z.string().nullable().meta({ description: 'The worker (host:pid) that last took the job up' }),
  progress: JobProgressAnswer,
  jobError: z.string().nullable().meta({ description: 'Why the job failed, in words; null unless it failed' }),
})
const runChecked: Same<z.infer<typeof RunAnswer>, Omit<RunView, 'result' | 'model'>> = true

export const RunWithResultAnswer = RunAnswer.extend({
  result: z.object({}).loose().nullable().meta({ description: 'Null until the job ends; a cancelled run keeps the points it computed. The Result (a sweep or a titration: its points; a map: `{ format: "map-columns", x, y, cells, cellsDone, failedCells, cancelled }`, its cells by columns), as the workbench shows it; concentrations in mol/L' }),
  model: z.object({}).loose().nullable().meta({ description: 'The compiled model that was solved (constants, conditions, `libraries`), as stored with the run; null for a run stored before models were' }),
})

export const RunStorageAnswer = z.object({
  usedBytes: z.int().meta({ description: 'Bytes the lab\'s stored runs take' }),
  budgetBytes: z.int().meta({ description: 'The lab\'s run storage budget (NUXT_RUN_STORAGE_BUDGET_MB)' }),
})
const storageChecked: Same<z.infer<typeof RunStorageAnswer>, RunStorage> = true

const LabRef = z.object({ slug: z.string(), name: z.string() })

export const SystemAnswer = z.object({
  lab: LabRef,
  role: z.enum(LAB_ROLES),
  system: z.object({ slug: z.string(), title: z.string(), isLibrary: z.boolean(), latest: RevisionAnswer }),
})
const systemChecked: Same<z.infer<typeof SystemAnswer>, SystemView> = true

export const SystemListAnswer = z.object({
  systems: z.array(z.object({
    slug: z.string(), title: z.string(), isLibrary: z.boolean(),
    latestRevision: z.int().nullable(), updatedAt: datetime.nullable(),
  })),
})

const systemListChecked: Same<z.infer<typeof SystemListAnswer>, SystemList> = true

export const LabListAnswer = z.object({ labs: z.array(z.object({ slug: z.string(), name: z.string(), role: z.enum(LAB_ROLES) })) })
const labListChecked: Same<z.infer<typeof LabListAnswer>, LabList> = true

export const MeAnswer = z.object({ user: z.object({ id: z.int(), email: z.string(), name: z.string(), isAdmin: z.boolean() }) })

export const RevisionAnswerWithLatest = z.object({
  revision: RevisionAnswer.extend({ parent: z.int().nullable() }),
  latestRevision: z.int(),
})
const revisionWithLatestChecked: Same<z.infer<typeof RevisionAnswerWithLatest>, RevisionWithLatest> = true

export const RevisionListAnswer = z.object({
  lab: LabRef,
  system: z.object({ slug: z.string(), title: z.string() }),
  role: z.enum(LAB_ROLES),
  revisions: z.array(RevisionSummaryAnswer),
})
const revisionListChecked: Same<z.infer<typeof RevisionListAnswer>, RevisionList> = true

// Referenced so the compile-time checks above are not reported as unused.
export const ANSWERS_CHECKED = revisionChecked && summaryChecked && runChecked && storageChecked && systemChecked && revisionListChecked && systemListChecked && labListChecked && revisionWithLatestChecked
