/**
 * Every table of Equipoise, with its relations, in one place. Migrations are
 * generated from this file by drizzle-kit (`npm run db:generate`) into
 * server/database/migrations/ and committed.
 */
import { relations, sql } from 'drizzle-orm'
import {
  boolean, datetime, index, int, json, longtext, mysqlEnum, mysqlTable, primaryKey,
  text, uniqueIndex, varchar,
} from 'drizzle-orm/mysql-core'
import { LAB_ROLES } from '../../shared/utils/roles'
import { API_TOKEN_SCOPES } from '../../shared/utils/token-schemas'
import { REVIEW_STATES } from '../../shared/types/review'
import { JOB_STATUSES } from '../../shared/types/job'

const createdAt = datetime('created_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`)

export const users = mysqlTable('users', {
  id: int('id').autoincrement().primaryKey(),
  email: varchar('email', { length: 254 }).notNull(),
  name: varchar('name', { length: 120 }).notNull(),
  passwordHash: varchar('password_hash', { length: 255 }).notNull(),
  isAdmin: boolean('is_admin').notNull().default(false),
  createdAt,
}, (t) => [uniqueIndex('users_email_unique').on(t.email)])

export const labs = mysqlTable('labs', {
  id: int('id').autoincrement().primaryKey(),
  slug: varchar('slug', { length: 64 }).notNull(),
  name: varchar('name', { length: 120 }).notNull(),
  createdBy: int('created_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt,
}, (t) => [uniqueIndex('labs_slug_unique').on(t.slug)])

export const labMembers = mysqlTable('lab_members', {
  labId: int('lab_id').notNull().references(() => labs.id, { onDelete: 'cascade' }),
  userId: int('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  role: mysqlEnum('role', LAB_ROLES).notNull(),
  createdAt,
}, (t) => [
  primaryKey({ columns: [t.labId, t.userId] }),
  index('lab_members_user_idx').on(t.userId),
])

export const systems = mysqlTable('systems', {
  id: int('id').autoincrement().primaryKey(),
  labId: int('lab_id').notNull().references(() => labs.id, { onDelete: 'cascade' }),
  slug: varchar('slug', { length: 64 }).notNull(),
  title: varchar('title', { length: 200 }).notNull(),
  /** A library system holds curated constants that other systems import. */
  isLibrary: boolean('is_library').notNull().default(false),
  /** The number of the system's newest stored run (runs count per system: 1, 2, 3 …; a deleted number is not given again). */
  lastRunNumber: int('last_run_number').notNull().default(0),
  createdBy: int('created_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt,
}, (t) => [uniqueIndex('systems_lab_slug_unique').on(t.labId, t.slug)])

export const revisions = mysqlTable('revisions', {
  id: int('id').autoincrement().primaryKey(),
  systemId: int('system_id').notNull().references(() => systems.id, { onDelete: 'cascade' }),
  number: int('number').notNull(),
  /** The revision this one was edited from (null for revision 1). */
  parentId: int('parent_id'),
  source: longtext('source').notNull(),
  sha256: varchar('sha256', { length: 64 }).notNull(),
  authorId: int('author_id').references(() => users.id, { onDelete: 'set null' }),
  message: varchar('message', { length: 500 }).notNull().default(''),
  createdAt,
}, (t) => [uniqueIndex('revisions_system_number_unique').on(t.systemId, t.number)])

export const runs = mysqlTable('runs', {
  id: int('id').autoincrement().primaryKey(),
  revisionId: int('revision_id').notNull().references(() => revisions.id, { onDelete: 'cascade' }),
  /** The run's number within its system (1 for the system's first run); `id` stays the key in URLs. */
  number: int('number').notNull().default(0),
  solverVersion: varchar('solver_version', { length: 40 }).notNull(),
  /** COMPILER_VERSION of shared/poise that compiled `model`; null for runs stored before models were. */
  compilerVersion: varchar('compiler_version', { length: 40 }),
  options: json('options').notNull(),
  /** The compiled model that was solved (JSON, with the library revisions it used); null for runs stored before models were. */
  model: longtext('model'),
  result: longtext('result'),
  /** Bytes of `model` plus `result` as stored, counted against the lab's run storage budget; null for older runs (then measured). */
  storedBytes: int('stored_bytes'),
  /** How the solve came out; null until the job is done (a cancelled job's kept points say it too). */
  status: mysqlEnum('status', ['ok', 'failed', 'diverged']),
  timingMs: int('timing_ms').notNull().default(0),
  createdBy: int('created_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt,
  /** The run as a job on the study queue (server/jobs/); runs from before jobs are `done`. */
  jobStatus: mysqlEnum('job_status', JOB_STATUSES).notNull().default('done'),
  /** The queue's id of the job (`run-ID`). */
  jobId: varchar('job_id', { length: 64 }),
  queuedAt: datetime('queued_at', { mode: 'date', fsp: 3 }),
  startedAt: datetime('started_at', { mode: 'date', fsp: 3 }),
  finishedAt: datetime('finished_at', { mode: 'date', fsp: 3 }),
  /** The worker (host:pid) that last took the job up. */
  worker: varchar('worker', { length: 120 }),
  /** Points done of `pointsTotal`, never decreasing (progress for the browser). */
  pointsDone: int('points_done').notNull().default(0),
  pointsTotal: int('points_total').notNull().default(0),
  /** When someone asked to cancel; the worker stops at its next point and keeps what it computed. */
  cancelRequestedAt: datetime('cancel_requested_at', { mode: 'date', fsp: 3 }),
  /** Why a job failed, in words for the user. */
  jobError: varchar('job_error', { length: 1000 }),
}, (t) => [
  index('runs_revision_idx').on(t.revisionId),
  index('runs_created_by_job_idx').on(t.createdBy, t.jobStatus),
])

/**
 * The points of a running job, stored slice by slice as the worker computes
 * them (server/jobs/), so a job taken up again after its worker died goes on
 * from the last stored slice. Joined into `runs.result` once, when the job
 * ends, and deleted in the same transaction.
 */
export const runParts = mysqlTable('run_parts', {
  id: int('id').autoincrement().primaryKey(),
  runId: int('run_id').notNull().references(() => runs.id, { onDelete: 'cascade' }),
  firstPoint: int('first_point').notNull(),
  pointCount: int('point_count').notNull(),
  failedPoints: int('failed_points').notNull().default(0),
  /** The slice: its points by columns in the binary form as base64, or a whole answer as JSON (server/jobs/store.ts, sliceBody). */
  body: longtext('body').notNull(),
}, (t) => [uniqueIndex('run_parts_run_first_unique').on(t.runId, t.firstPoint)])

/**
 * A data set: measurements uploaded to a system as CSV for fitting
 * constants (shared/fit/dataset.ts reads it). The file is kept as uploaded
 * (`source`, with its SHA-256, which a fitted constant's citation names),
 * and its parsed headers and rows beside it.
 */
export const datasets = mysqlTable('datasets', {
  id: int('id').autoincrement().primaryKey(),
  systemId: int('system_id').notNull().references(() => systems.id, { onDelete: 'cascade' }),
  name: varchar('name', { length: 200 }).notNull(),
  filename: varchar('filename', { length: 255 }).notNull(),
  /** The headers as written, study variable first (JSON array of strings). */
  columns: json('columns').notNull(),
  /** The parsed rows (JSON: arrays of numbers, null for an empty cell). */
  rows: longtext('rows').notNull(),
  rowCount: int('row_count').notNull(),
  source: longtext('source').notNull(),
  sha256: varchar('sha256', { length: 64 }).notNull(),
  createdBy: int('created_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt,
}, (t) => [uniqueIndex('datasets_system_name_unique').on(t.systemId, t.name)])

export const auditLog = mysqlTable('audit_log', {
  id: int('id').autoincrement().primaryKey(),
  actorId: int('actor_id').references(() => users.id, { onDelete: 'set null' }),
  labId: int('lab_id').references(() => labs.id, { onDelete: 'set null' }),
  action: varchar('action', { length: 64 }).notNull(),
  /** What the action was about, as a short JSON object (ids, slugs, roles). */
  detail: text('detail'),
  createdAt,
}, (t) => [index('audit_log_lab_idx').on(t.labId)])

export const usersRelations = relations(users, ({ many }) => ({
  memberships: many(labMembers),
}))

export const labsRelations = relations(labs, ({ many }) => ({
  members: many(labMembers),
  systems: many(systems),
}))

export const labMembersRelations = relations(labMembers, ({ one }) => ({
  lab: one(labs, { fields: [labMembers.labId], references: [labs.id] }),
  user: one(users, { fields: [labMembers.userId], references: [users.id] }),
}))

export const systemsRelations = relations(systems, ({ one, many }) => ({
  lab: one(labs, { fields: [systems.labId], references: [labs.id] }),
  revisions: many(revisions),
}))

export const revisionsRelations = relations(revisions, ({ one, many }) => ({
  system: one(systems, { fields: [revisions.systemId], references: [systems.id] }),
  author: one(users, { fields: [revisions.authorId], references: [users.id] }),
  runs: many(runs),
}))

export const runsRelations = relations(runs, ({ one }) => ({
  revision: one(revisions, { fields: [runs.revisionId], references: [revisions.id] }),
}))

export type User = typeof users.$inferSelect
export type Lab = typeof labs.$inferSelect
export type LabMember = typeof labMembers.$inferSelect
export type System = typeof systems.$inferSelect
export type Revision = typeof revisions.$inferSelect
export type Run = typeof runs.$inferSelect
export type Dataset = typeof datasets.$inferSelect

/** One asks a member (reviewer or higher) to review revision `to` of a system against revision `from`. */

export const reviews = mysqlTable('reviews', {
  id: int('id').autoincrement().primaryKey(),
  labId: int('lab_id').notNull().references(() => labs.id, { onDelete: 'cascade' }),
  systemId: int('system_id').notNull().references(() => systems.id, { onDelete: 'cascade' }),
  fromRevisionId: int('from_revision_id').notNull().references(() => revisions.id, { onDelete: 'cascade' }),
  toRevisionId: int('to_revision_id').notNull().references(() => revisions.id, { onDelete: 'cascade' }),
  requestedBy: int('requested_by').references(() => users.id, { onDelete: 'set null' }),
  reviewerId: int('reviewer_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  state: mysqlEnum('state', REVIEW_STATES).notNull().default('open'),
  /** What the requester asks the reviewer to look at. */
  note: varchar('note', { length: 2000 }).notNull().default(''),
  /** The reviewer's summary when approving or asking for changes. */
  decisionNote: varchar('decision_note', { length: 2000 }).notNull().default(''),
  decidedAt: datetime('decided_at', { mode: 'date', fsp: 3 }),
  createdAt,
}, (t) => [
  index('reviews_system_idx').on(t.systemId),
  index('reviews_reviewer_state_idx').on(t.reviewerId, t.state),
])

/** A comment on one line of either side of a review's compare ('from' or 'to'). */
export const reviewComments = mysqlTable('review_comments', {
  id: int('id').autoincrement().primaryKey(),
  reviewId: int('review_id').notNull().references(() => reviews.id, { onDelete: 'cascade' }),
  authorId: int('author_id').references(() => users.id, { onDelete: 'set null' }),
  side: mysqlEnum('side', ['from', 'to']).notNull(),
  line: int('line').notNull(),
  body: text('body').notNull(),
  createdAt,
}, (t) => [index('review_comments_review_idx').on(t.reviewId)])

export const reviewsRelations = relations(reviews, ({ one, many }) => ({
  lab: one(labs, { fields: [reviews.labId], references: [labs.id] }),
  system: one(systems, { fields: [reviews.systemId], references: [systems.id] }),
  fromRevision: one(revisions, { fields: [reviews.fromRevisionId], references: [revisions.id], relationName: 'reviewFrom' }),
  toRevision: one(revisions, { fields: [reviews.toRevisionId], references: [revisions.id], relationName: 'reviewTo' }),
  requester: one(users, { fields: [reviews.requestedBy], references: [users.id], relationName: 'reviewRequester' }),
  reviewer: one(users, { fields: [reviews.reviewerId], references: [users.id], relationName: 'reviewReviewer' }),
  comments: many(reviewComments),
}))

export const reviewCommentsRelations = relations(reviewComments, ({ one }) => ({
  review: one(reviews, { fields: [reviewComments.reviewId], references: [reviews.id] }),
  author: one(users, { fields: [reviewComments.authorId], references: [users.id] }),
}))

export type Review = typeof reviews.$inferSelect
export type ReviewComment = typeof reviewComments.$inferSelect

/**
 * An owner's invitation of an e-mail address into a lab with a role. Only the
 * sha256 of the link's token is kept, so a database reader cannot use it; the
 * link works once (acceptedAt), until expiresAt, and not after withdrawal.
 */
export const invitations = mysqlTable('invitations', {
  id: int('id').autoincrement().primaryKey(),
  labId: int('lab_id').notNull().references(() => labs.id, { onDelete: 'cascade' }),
  email: varchar('email', { length: 254 }).notNull(),
  role: mysqlEnum('role', LAB_ROLES).notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  invitedBy: int('invited_by').references(() => users.id, { onDelete: 'set null' }),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  acceptedAt: datetime('accepted_at', { mode: 'date', fsp: 3 }),
  acceptedBy: int('accepted_by').references(() => users.id, { onDelete: 'set null' }),
  /** When an owner withdrew it: the link stops working, and the row stays so it still counts against the hourly limit. */
  withdrawnAt: datetime('withdrawn_at', { mode: 'date', fsp: 3 }),
  createdAt,
}, (t) => [
  uniqueIndex('invitations_token_unique').on(t.tokenHash),
  index('invitations_lab_idx').on(t.labId),
])

/** A single-use, expiring password reset link sent by mail (token kept as sha256 only). */
export const passwordResets = mysqlTable('password_resets', {
  id: int('id').autoincrement().primaryKey(),
  userId: int('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
  createdAt,
}, (t) => [
  uniqueIndex('password_resets_token_unique').on(t.tokenHash),
  index('password_resets_user_idx').on(t.userId),
])

export const invitationsRelations = relations(invitations, ({ one }) => ({
  lab: one(labs, { fields: [invitations.labId], references: [labs.id] }),
  inviter: one(users, { fields: [invitations.invitedBy], references: [users.id] }),
}))

export const passwordResetsRelations = relations(passwordResets, ({ one }) => ({
  user: one(users, { fields: [passwordResets.userId], references: [users.id] }),
}))

export type Invitation = typeof invitations.$inferSelect
export type PasswordReset = typeof passwordResets.$inferSelect

/**
 * One signed-in session. The sealed cookie carries a random token; only its
 * sha256 is kept here. A request is signed in only while its row exists and
 * is within the idle and absolute lifetimes (see server/utils/sessions.ts):
 * signing out deletes the row, so a copied cookie stops working too.
 */
export const sessions = mysqlTable('sessions', {
  id: int('id').autoincrement().primaryKey(),
  userId: int('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  lastSeenAt: datetime('last_seen_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  /** The browser that signed in, shortened, so a person can tell sessions apart. */
  userAgent: varchar('user_agent', { length: 200 }).notNull().default(''),
  createdAt,
}, (t) => [
  uniqueIndex('sessions_token_unique').on(t.tokenHash),
  index('sessions_user_idx').on(t.userId),
])

/**
 * A personal API token (Authorization: Bearer) for scripts and the command
 * line. Only the secret's sha256 is kept; the secret is shown once, when the
 * token is made. A revoked token keeps its row (for the audit trail) with
 * `revokedAt` set; see server/utils/api-tokens.ts.
 */
export const apiTokens = mysqlTable('api_tokens', {
  id: int('id').autoincrement().primaryKey(),
  userId: int('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  name: varchar('name', { length: 80 }).notNull(),
  scope: mysqlEnum('scope', API_TOKEN_SCOPES).notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  lastUsedAt: datetime('last_used_at', { mode: 'date', fsp: 3 }),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }),
  revokedAt: datetime('revoked_at', { mode: 'date', fsp: 3 }),
  createdAt,
}, (t) => [
  uniqueIndex('api_tokens_token_unique').on(t.tokenHash),
  index('api_tokens_user_idx').on(t.userId),
])

/**
 * Counters of the rate limits that must hold across restarts and server
 * processes (failed sign-ins per account and address, per address; see
 * server/utils/limits.ts). A counter starts over when its window has passed.
 */
export const throttleCounters = mysqlTable('throttle_counters', {
  key: varchar('key', { length: 320 }).primaryKey(),
  hits: int('hits').notNull(),
  firstAt: datetime('first_at', { mode: 'date', fsp: 3 }).notNull(),
  lastAt: datetime('last_at', { mode: 'date', fsp: 3 }).notNull(),
})

/**
 * A registration waiting for its address to be confirmed: the account is
 * created only when the mailed link is opened, with the name and password of
 * that registration (token kept as sha256 only).
 */
export const pendingRegistrations = mysqlTable('pending_registrations', {
  id: int('id').autoincrement().primaryKey(),
  email: varchar('email', { length: 254 }).notNull(),
  name: varchar('name', { length: 120 }).notNull(),
  passwordHash: varchar('password_hash', { length: 255 }).notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
  createdAt,
}, (t) => [
  uniqueIndex('pending_registrations_token_unique').on(t.tokenHash),
  index('pending_registrations_email_idx').on(t.email),
])

export type Session = typeof sessions.$inferSelect
export type ApiToken = typeof apiTokens.$inferSelect
export type PendingRegistration = typeof pendingRegistrations.$inferSelect
export type ThrottleCounter = typeof throttleCounters.$inferSelect
