/**
 * Every API route, as the OpenAPI description (document.ts) lists it: its
 * method and path, who may call it, the zod schemas it validates its
 * parameters, query and body with (the same objects the route uses), what
 * it answers and which errors it can give. tests/nuxt/openapi.test.ts fails
 * when a file under server/api/ has no entry here.
 */
import { z } from 'zod'
import { LoginBody, PasswordChangeBody, RegisterBody } from '../../shared/utils/account-schemas'
import {
  InvitationAcceptBody, InvitationCreateBody, InvitationRegisterBody, PasswordForgotBody, PasswordResetBody, RegisterConfirmBody,
} from '../../shared/utils/invitation-schemas'
import { LabCreateBody, LabParams, MemberParams, MemberUpdateBody, SystemCreateBody, SystemParams, SystemUpdateBody } from '../../shared/utils/lab-schemas'
import { LibraryMarkBody, LibraryParams, LibraryRevisionParams } from '../../shared/utils/library-schemas'
import { ImportRevisionFields, ImportSystemFields } from '../../shared/utils/upload-schemas'
import { ApplyFitBody, DatasetFields, DatasetParams, FitBody } from '../../shared/utils/dataset-schemas'
import { ApiTokenParams, ApiTokenSummarySchema, CreateApiTokenBody, CreatedApiTokenSchema } from '../../shared/utils/token-schemas'
import { SourceBody } from '../utils/source-body'
import { ReviewParams } from '../utils/review-params'
import { RevisionParams } from '../utils/revision-params'
import { Body as AdminUserBody, Params as AdminUserParams } from '../api/admin/users/[user].patch'
import { Params as ExampleParams } from '../api/examples/[example].get'
import { Params as InvitationLinkParams } from '../api/invitations/[token].get'
import { Params as InvitationIdParams } from '../api/labs/[lab]/invitations/[id].delete'
import { Body as CommentBody } from '../api/labs/[lab]/reviews/[id]/comments.post'
import { Body as DecisionBody } from '../api/labs/[lab]/reviews/[id]/decision.post'
import { Query as ReviewListQuery } from '../api/labs/[lab]/reviews/index.get'
import { Body as ReviewCreateBody } from '../api/labs/[lab]/reviews/index.post'
import { Query as CompareQuery } from '../api/labs/[lab]/systems/[system]/compare.get'
import { Body as RestoreBody } from '../api/labs/[lab]/systems/[system]/revisions/[number]/restore.post'
import { Params as RunParams } from '../api/labs/[lab]/systems/[system]/runs/[run].get'
import { Params as RunsParams } from '../api/labs/[lab]/systems/[system]/runs/index.get'
import { Body as RunCreateBody } from '../api/labs/[lab]/systems/[system]/runs/index.post'
import {
  LabListAnswer, MeAnswer, RevisionAnswer, RevisionAnswerWithLatest, RevisionListAnswer, RunAnswer, RunStorageAnswer, RunWithResultAnswer, SystemAnswer, SystemListAnswer,
} from './answers'
import { Params as RunDeleteParams } from '../api/labs/[lab]/systems/[system]/runs/[run].delete'
import { Params as RunCancelParams } from '../api/labs/[lab]/systems/[system]/runs/[run]/cancel.post'

/**
 * Who may call a route: `anyone`; `signed-in` (cookie or API token);
 * `browser` (the cookie only: 403 to a token); a lab role (cookie or token,
 * 404 to non-members); `admin` (site administrators, cookie only).
 */
export type Access = 'anyone' | 'signed-in' | 'browser' | 'viewer' | 'reviewer' | 'editor' | 'owner' | 'admin'

export interface RouteDoc {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete'
  /** The path as the file names it, with {name} for [name]. */
  path: string
  tag: string
  summary: string
  description?: string
  access: Access
  params?: z.ZodObject
  query?: z.ZodObject
  body?: z.ZodType
  /** A multipart upload: the fields beside the `file` part. */
  upload?: z.ZodObject
  /** The answer on success: its status, what it holds, and its schema when the route's answer has one. */
  ok: { status: number, description: string, schema?: z.ZodType }
  /** Errors beyond those implied by access, parameters and body (which document.ts adds). */
  errors?: Partial<Record<number, string>>
}

const SOURCE_ANSWER = '`{ diagnostics }` for text with errors, or the diagnostics, the Result (a sweep: `points`), the `model` that was solved and `compilerVersion` / `solverVersion`, stored nowhere. A sweep comes by columns (`application/vnd.equipoise.binary-answer`: a JSON head, `result` a SweepColumns, with its numbers as raw arrays after it) when `Accept` names that type'
const TOO_MANY_SOLVES = 'This account already has NUXT_SOLVES_PER_USER solves running or waiting; the message names the limit'
const STALE = 'The base revision is not the latest: `data.latestRevision`, `data.latest` (its text) and `data.yourSource`'

export const ROUTES: RouteDoc[] = [
  // Accounts
  { method: 'post', path: '/api/auth/register', tag: 'Accounts', access: 'anyone', body: RegisterBody, summary: 'Register (mails a confirmation link)', ok: { status: 202, description: '`{ message }`, the same for every address' }, errors: { 429: 'Too many registrations from this address' } },
  { method: 'post', path: '/api/auth/register/confirm', tag: 'Accounts', access: 'anyone', body: RegisterConfirmBody, summary: 'Confirm a registration with the mailed token; creates the account and signs in', ok: { status: 201, description: '`{ user }`; sets the session cookie' }, errors: { 404: 'The link is unknown, used or expired' } },
  { method: 'post', path: '/api/auth/login', tag: 'Accounts', access: 'anyone', body: LoginBody, summary: 'Sign in', ok: { status: 200, description: '`{ user }`; sets the session cookie' }, errors: { 401: 'Wrong e-mail or password', 429: 'Too many failed sign-ins; `Retry-After` says when to try again' } },
  { method: 'post', path: '/api/auth/logout', tag: 'Accounts', access: 'anyone', summary: 'Sign out: ends this session for good', ok: { status: 200, description: '`{ signedOut: true }`' } },
  { method: 'post', path: '/api/auth/password', tag: 'Accounts', access: 'browser', body: PasswordChangeBody, summary: "Change one's password; ends the account's other sessions", ok: { status: 200, description: '`{ changed, otherSessionsEnded }`' }, errors: { 400: 'The current password is wrong, or the new one too short' } },
  { method: 'post', path: '/api/auth/password/forgot', tag: 'Accounts', access: 'anyone', body: PasswordForgotBody, summary: 'Ask for a password reset link by mail', ok: { status: 202, description: '`{ message }`, the same for every address' } },
  { method: 'post', path: '/api/auth/password/reset', tag: 'Accounts', access: 'anyone', body: PasswordResetBody, summary: 'Set a new password with the mailed token; signs the account out everywhere', ok: { status: 200, description: '`{ changed: true }`' }, errors: { 404: 'The link is unknown, used or expired' } },
  { method: 'get', path: '/api/me', tag: 'Accounts', access: 'signed-in', summary: 'Who is signed in', ok: { status: 200, description: 'The signed-in account', schema: MeAnswer } },
  { method: 'get', path: '/api/me/sessions', tag: 'Accounts', access: 'browser', summary: 'The sessions of the account signed in elsewhere', ok: { status: 200, description: '`{ lifetimes, others: [{ signedInAt, lastSeenAt, userAgent }] }`' } },
  { method: 'delete', path: '/api/me/sessions', tag: 'Accounts', access: 'browser', summary: 'Sign out every other session', ok: { status: 200, description: '`{ ended }`' } },
  { method: 'get', path: '/api/me/recent-systems', tag: 'Accounts', access: 'signed-in', summary: "My labs' systems, newest save first (8)", ok: { status: 200, description: '`{ systems: [{ …, savedAt }] }`' } },
  { method: 'get', path: '/api/me/tokens', tag: 'API tokens', access: 'browser', summary: 'My live API tokens (never their secrets)', ok: { status: 200, description: 'The tokens, newest first', schema: z.object({ tokens: ApiTokenSummarySchema.array() }) } },
  { method: 'post', path: '/api/me/tokens', tag: 'API tokens', access: 'browser', body: CreateApiTokenBody, summary: 'Make an API token; the only answer that holds its secret', ok: { status: 201, description: 'The token and its secret', schema: CreatedApiTokenSchema }, errors: { 409: 'Already 20 live tokens: revoke one first' } },
  { method: 'delete', path: '/api/me/tokens/{id}', tag: 'API tokens', access: 'browser', params: ApiTokenParams, summary: 'Revoke an API token at once', ok: { status: 200, description: '`{ revoked: id }`' }, errors: { 404: 'No live token of yours with this id' } },
  { method: 'get', path: '/api/reviews/waiting', tag: 'Reviews', access: 'signed-in', summary: 'Reviews asked of me and asked by me', ok: { status: 200, description: '`{ waiting, requested }`: asked of me, asked by me' } },

  // Invitations
  { method: 'get', path: '/api/invitations/{token}', tag: 'Invitations', access: 'anyone', params: InvitationLinkParams, summary: "An invitation link's lab, role and address", ok: { status: 200, description: '`{ lab, email, role, invitedBy, expiresAt }`' }, errors: { 404: 'The link is unknown, used, withdrawn or expired' } },
  { method: 'post', path: '/api/invitations/accept', tag: 'Invitations', access: 'signed-in', body: InvitationAcceptBody, summary: 'Accept an invitation (the signed-in address must be the invited one)', ok: { status: 200, description: '`{ lab, role }`' }, errors: { 404: 'The link is unknown, used, withdrawn or expired' } },
  { method: 'post', path: '/api/invitations/register', tag: 'Invitations', access: 'anyone', body: InvitationRegisterBody, summary: 'Create an account from an invitation link and join the lab', ok: { status: 201, description: '`{ user, lab, role }`; sets the session cookie' }, errors: { 404: 'The link is unknown, used, withdrawn or expired', 409: 'The address already has an account: sign in and accept' } },

  // Examples and stateless checks
  { method: 'get', path: '/api/examples', tag: 'Examples', access: 'anyone', summary: 'The shipped example systems', ok: { status: 200, description: '`{ examples }`' } },
  { method: 'get', path: '/api/examples/{example}', tag: 'Examples', access: 'anyone', params: ExampleParams, summary: "One example's text", ok: { status: 200, description: 'The example with its text' }, errors: { 404: 'No such example' } },
  { method: 'get', path: '/api/examples/{example}/result', tag: 'Examples', access: 'anyone', params: ExampleParams, summary: 'An example solved: its model and its answer (kept until the server restarts)', ok: { status: 200, description: '`{ slug, title, kind, solverVersion, compilerVersion, model, result }`' }, errors: { 404: 'No such example', 503: 'The solver is busy; ask again' } },
  { method: 'post', path: '/api/check', tag: 'Solve', access: 'signed-in', body: SourceBody, summary: 'Check Poise text (no libraries)', ok: { status: 200, description: '`{ ok, diagnostics, summary }`' } },
  { method: 'post', path: '/api/solve', tag: 'Solve', access: 'signed-in', body: SourceBody, summary: 'Solve Poise text (no libraries), stored nowhere', ok: { status: 200, description: SOURCE_ANSWER }, errors: { 413: 'A sweep with too many points', 429: TOO_MANY_SOLVES, 503: 'The solver is busy; try again' } },

  // Labs and members
  { method: 'get', path: '/api/labs', tag: 'Labs', access: 'signed-in', summary: 'My labs, with my role', ok: { status: 200, description: 'My labs', schema: LabListAnswer } },
  { method: 'post', path: '/api/labs', tag: 'Labs', access: 'signed-in', body: LabCreateBody, summary: 'Create a lab; the creator is its owner', ok: { status: 201, description: '`{ lab: { slug, name, role } }`' }, errors: { 409: 'The short name is taken' } },
  { method: 'get', path: '/api/labs/{lab}', tag: 'Labs', access: 'viewer', params: LabParams, summary: 'A lab and my role in it', ok: { status: 200, description: '`{ lab, role, memberCount, … }`' } },
  { method: 'post', path: '/api/labs/{lab}/check', tag: 'Solve', access: 'viewer', params: LabParams, body: SourceBody, summary: "Check Poise text with the lab's libraries", ok: { status: 200, description: '`{ ok, diagnostics, summary }`' } },
  { method: 'post', path: '/api/labs/{lab}/solve', tag: 'Solve', access: 'viewer', params: LabParams, body: SourceBody, summary: "Solve Poise text with the lab's libraries (a preview, stored nowhere; a viewer's Run)", ok: { status: 200, description: SOURCE_ANSWER }, errors: { 413: 'A sweep with too many points', 429: TOO_MANY_SOLVES, 503: 'The solver is busy; try again' } },
  { method: 'get', path: '/api/labs/{lab}/members', tag: 'Labs', access: 'viewer', params: LabParams, summary: "The lab's members and their roles", ok: { status: 200, description: '`{ members, myRole }`' } },
  { method: 'post', path: '/api/labs/{lab}/members', tag: 'Labs', access: 'owner', params: LabParams, body: InvitationCreateBody, summary: 'Invite someone into the lab (as POST …/invitations)', ok: { status: 201, description: '`{ invitation, mailed }`; the same answer whether or not the address has an account' }, errors: { 409: 'Already a member or invited', 429: 'Too many invitations this hour' } },
  { method: 'patch', path: '/api/labs/{lab}/members/{user}', tag: 'Labs', access: 'owner', params: MemberParams, body: MemberUpdateBody, summary: "Change a member's role", ok: { status: 200, description: '`{ member: { id, role } }`' }, errors: { 409: 'The lab would have no owner' } },
  { method: 'delete', path: '/api/labs/{lab}/members/{user}', tag: 'Labs', access: 'viewer', params: MemberParams, summary: 'Remove a member (owners), or leave the lab (anyone, for themselves)', ok: { status: 200, description: '`{ removed: userId }`' }, errors: { 409: 'The lab would have no owner' } },
  { method: 'get', path: '/api/labs/{lab}/invitations', tag: 'Invitations', access: 'owner', params: LabParams, summary: "The lab's open invitations", ok: { status: 200, description: '`{ invitations }`' } },
  { method: 'post', path: '/api/labs/{lab}/invitations', tag: 'Invitations', access: 'owner', params: LabParams, body: InvitationCreateBody, summary: 'Invite an address into the lab with a role', ok: { status: 201, description: '`{ invitation, mailed }`' }, errors: { 409: 'Already a member or invited', 429: 'Too many invitations this hour' } },
  { method: 'delete', path: '/api/labs/{lab}/invitations/{id}', tag: 'Invitations', access: 'owner', params: InvitationIdParams, summary: 'Withdraw an invitation', ok: { status: 200, description: '`{ withdrawn: true }`' } },

  // Systems and revisions
  { method: 'get', path: '/api/labs/{lab}/systems', tag: 'Systems', access: 'viewer', params: LabParams, summary: "The lab's systems with their latest revision", ok: { status: 200, description: 'The systems, by title', schema: SystemListAnswer } },
  { method: 'post', path: '/api/labs/{lab}/systems', tag: 'Systems', access: 'editor', params: LabParams, body: SystemCreateBody, summary: 'Create a system (revision 1)', ok: { status: 201, description: '`{ system: { slug, title, isLibrary, latest } }`' }, errors: { 409: 'The short name is taken in this lab' } },
  { method: 'get', path: '/api/labs/{lab}/systems/{system}', tag: 'Systems', access: 'viewer', params: SystemParams, summary: 'A system with its latest revision (text included)', ok: { status: 200, description: 'The system and its latest revision', schema: SystemAnswer } },
  { method: 'patch', path: '/api/labs/{lab}/systems/{system}', tag: 'Systems', access: 'editor', params: SystemParams, body: SystemUpdateBody, summary: 'Rename, and/or save `source` as the next revision from `baseRevision`', ok: { status: 200, description: 'The system with the new latest revision', schema: SystemAnswer.pick({ system: true }) }, errors: { 409: STALE } },
  { method: 'delete', path: '/api/labs/{lab}/systems/{system}', tag: 'Systems', access: 'editor', params: SystemParams, summary: 'Delete a system and its history', ok: { status: 200, description: '`{ deleted: slug }`' }, errors: { 409: 'Systems of the lab use it as a library' } },
  { method: 'put', path: '/api/labs/{lab}/systems/{system}/library', tag: 'Libraries', access: 'editor', params: SystemParams, body: LibraryMarkBody, summary: 'Mark or unmark a system as a lab library', ok: { status: 200, description: '`{ system: { slug, title, isLibrary, latestRevision } }`' } },
  { method: 'get', path: '/api/labs/{lab}/systems/{system}/revisions', tag: 'Systems', access: 'viewer', params: SystemParams, summary: 'Every revision, newest first, with author, newest run and reviews', ok: { status: 200, description: 'The revisions, newest first', schema: RevisionListAnswer } },
  { method: 'get', path: '/api/labs/{lab}/systems/{system}/revisions/{number}', tag: 'Systems', access: 'viewer', params: RevisionParams, summary: 'One revision with its text', ok: { status: 200, description: 'The revision and the number of the latest', schema: RevisionAnswerWithLatest } },
  { method: 'post', path: '/api/labs/{lab}/systems/{system}/revisions/{number}/restore', tag: 'Systems', access: 'editor', params: RevisionParams, body: RestoreBody, summary: "Save an older revision's text as the next revision", ok: { status: 201, description: 'The new revision', schema: z.object({ revision: RevisionAnswer.extend({ parent: z.int() }) }) }, errors: { 409: STALE } },
  { method: 'get', path: '/api/labs/{lab}/systems/{system}/compare', tag: 'Systems', access: 'viewer', params: SystemParams, query: CompareQuery, summary: 'Text, model and results differences between two revisions', description: 'A read: never stores a run. Each side is the revision\'s newest stored run (its stored model and answer), or the revision solved now and not stored; `solved.from` / `solved.to` say which.', ok: { status: 200, description: '`{ lab, system, role, latestRevision, from, to, modelDiff, resultsDiff, solved, problems }`' } },
  { method: 'post', path: '/api/labs/{lab}/imports', tag: 'Systems', access: 'editor', params: LabParams, upload: ImportSystemFields, summary: 'Create a system from an uploaded .poise file', ok: { status: 201, description: '`{ system }`' }, errors: { 409: 'The short name is taken in this lab' } },
  { method: 'post', path: '/api/labs/{lab}/systems/{system}/imports', tag: 'Systems', access: 'editor', params: SystemParams, upload: ImportRevisionFields, summary: 'Save an uploaded .poise file as the next revision', ok: { status: 201, description: '`{ system }`' }, errors: { 409: STALE } },

  // Runs
  { method: 'get', path: '/api/labs/{lab}/systems/{system}/runs', tag: 'Runs', access: 'viewer', params: RunsParams, summary: "The system's runs, newest first, without results, and the lab's run storage", ok: { status: 200, description: 'The runs, newest first, and `storage: { usedBytes, budgetBytes }`', schema: z.object({ runs: z.array(RunAnswer), storage: RunStorageAnswer }) } },
  { method: 'post', path: '/api/labs/{lab}/systems/{system}/runs', tag: 'Runs', access: 'reviewer', params: RunsParams, body: RunCreateBody, summary: 'Queue a run of a saved revision (the latest unless `revision`); a worker solves it and stores it with the model it solved', description: 'What the workbench\'s Run button does for reviewers, editors and owners (a viewer\'s Run is a preview: POST /api/labs/{lab}/solve). A read-only API token cannot (it stores a run). Answers at once with `jobStatus` "queued"; read GET …/runs/{run} until `jobStatus` is done, failed or cancelled (`progress` says how far it got).', ok: { status: 201, description: 'The queued run, its `model`, `result` null', schema: RunWithResultAnswer }, errors: { 409: 'The lab\'s run storage budget is spent; the message says how much is used and what to do', 422: 'The run has more points than one job may compute; the message says the limit', 429: 'The account already has its limit of runs queued or running (Retry-After)', 503: 'The study queue cannot be reached; try again' } },
  { method: 'post', path: '/api/labs/{lab}/systems/{system}/runs/{run}/cancel', tag: 'Runs', access: 'reviewer', params: RunCancelParams, summary: 'Cancel a queued or running run', description: 'A queued run ends at once; a running one stops within about a second and keeps the points it computed, `jobStatus` "cancelled". Who started the run may cancel it, and editors and owners any run.', ok: { status: 200, description: 'The run as it is now', schema: RunAnswer }, errors: { 403: 'Neither who started the run nor an editor', 404: 'No such run of this system', 409: 'The run has already ended' } },
  { method: 'delete', path: '/api/labs/{lab}/systems/{system}/runs/{run}', tag: 'Runs', access: 'editor', params: RunDeleteParams, summary: 'Delete a stored run to free the lab\'s run storage (audit-logged)', ok: { status: 200, description: 'The id deleted and the lab\'s run storage after', schema: z.object({ deleted: z.int(), storage: RunStorageAnswer }) }, errors: { 404: 'No such run of this system' } },
  { method: 'get', path: '/api/labs/{lab}/systems/{system}/runs/{run}', tag: 'Runs', access: 'viewer', params: RunParams, summary: 'One stored run with its result and the model it solved', ok: { status: 200, description: 'The run, its `result` and `model` (null for a run stored before models were)', schema: RunWithResultAnswer } },

  // Data sets and fitting
  { method: 'get', path: '/api/labs/{lab}/systems/{system}/datasets', tag: 'Data sets', access: 'viewer', params: SystemParams, summary: "The system's data sets, newest first", ok: { status: 200, description: '`{ datasets: [{ id, name, filename, columns, rowCount, sha256, createdBy, createdAt }] }`' } },
  { method: 'post', path: '/api/labs/{lab}/systems/{system}/datasets', tag: 'Data sets', access: 'editor', params: SystemParams, upload: DatasetFields, summary: 'Upload a CSV of measurements (first column the study variable, then measured quantities)', description: 'A file with mistakes is refused whole: a 400 whose `data.problems` gives `{ line, column, message, text }` for each. Audit-logged.', ok: { status: 201, description: '`{ dataset }`' }, errors: { 409: 'The system already has a data set of that name' } },
  { method: 'get', path: '/api/labs/{lab}/systems/{system}/datasets/{dataset}', tag: 'Data sets', access: 'viewer', params: DatasetParams, summary: 'One data set with its rows', ok: { status: 200, description: '`{ dataset: { …, rows } }` (rows of numbers, null for an empty cell)' }, errors: { 404: 'No such data set in this system' } },
  { method: 'delete', path: '/api/labs/{lab}/systems/{system}/datasets/{dataset}', tag: 'Data sets', access: 'editor', params: DatasetParams, summary: 'Delete a data set (audit-logged; revisions citing it keep their citation)', ok: { status: 200, description: '`{ deleted }`' }, errors: { 404: 'No such data set in this system' } },
  { method: 'post', path: '/api/labs/{lab}/systems/{system}/datasets/{dataset}/fit', tag: 'Data sets', access: 'viewer', params: DatasetParams, body: FitBody, summary: 'Fit the constants a revision marks `fit` to the data set (stores nothing)', description: 'Levenberg–Marquardt on exact solves in the solver pool. The answer\'s `fit` holds `converged`, `iterations`, `points`, `degreesOfFreedom`, `residualStandardDeviation`, `constants: [{ reaction, kind, value, standardError, … }]`, `correlation`, `warnings`, per-column `fitted`/`residual` and the fitted `curve`.', ok: { status: 200, description: '`{ revision, dataset, fit }`' }, errors: { 404: 'No such data set or revision', 422: 'The fit cannot run: nothing is marked `fit`, a column the model cannot predict, too few values, or the model does not solve; the message says what to change', 429: TOO_MANY_SOLVES } },
  { method: 'post', path: '/api/labs/{lab}/systems/{system}/datasets/{dataset}/apply', tag: 'Data sets', access: 'editor', params: DatasetParams, body: ApplyFitBody, summary: 'Use the fitted values: save the next revision with each fitted constant\'s value, ± and a citation of the data set', description: 'Fits the latest revision again (it must be `baseRevision`) and writes value ± standard error and `cite "fitted to data set NAME (sha256 …)"` on each fitted constant\'s line. Audit-logged.', ok: { status: 201, description: '`{ revision, fit }`' }, errors: { 409: STALE, 422: 'The fit cannot run, did not converge, or determines no constant; nothing was saved', 429: TOO_MANY_SOLVES } },

  // Libraries
  { method: 'get', path: '/api/labs/{lab}/libraries', tag: 'Libraries', access: 'viewer', params: LabParams, summary: "The lab's libraries with their latest revision", ok: { status: 200, description: '`{ libraries: [{ …, latestRevision }] }`' } },
  { method: 'get', path: '/api/labs/{lab}/libraries/{name}', tag: 'Libraries', access: 'viewer', params: LibraryParams, summary: "A library's revisions and the systems that use it", ok: { status: 200, description: '`{ library, revisions, usedBy }`' } },
  { method: 'get', path: '/api/labs/{lab}/libraries/{name}/revisions/{n}', tag: 'Libraries', access: 'viewer', params: LibraryRevisionParams, summary: 'The text of one library revision', ok: { status: 200, description: '`{ name, revision, sha256, source }`' } },

  // Reviews
  { method: 'get', path: '/api/labs/{lab}/reviews', tag: 'Reviews', access: 'viewer', params: LabParams, query: ReviewListQuery, summary: "The lab's reviews (by system, by state)", ok: { status: 200, description: '`{ reviews }`' } },
  { method: 'post', path: '/api/labs/{lab}/reviews', tag: 'Reviews', access: 'editor', params: LabParams, body: ReviewCreateBody, summary: 'Ask a member to review the change between two revisions', ok: { status: 201, description: '`{ review }`' } },
  { method: 'get', path: '/api/labs/{lab}/reviews/{id}', tag: 'Reviews', access: 'viewer', params: ReviewParams, summary: 'A review with its comments and differences', ok: { status: 200, description: '`{ review, comments, role, canComment, canDecide }`' } },
  { method: 'post', path: '/api/labs/{lab}/reviews/{id}/comments', tag: 'Reviews', access: 'reviewer', params: ReviewParams, body: CommentBody, summary: 'Comment on a line of either side', ok: { status: 201, description: '`{ comments }`, all of the review' } },
  { method: 'post', path: '/api/labs/{lab}/reviews/{id}/decision', tag: 'Reviews', access: 'reviewer', params: ReviewParams, body: DecisionBody, summary: 'Approve or ask for changes (only the member asked)', ok: { status: 200, description: '`{ review }`' }, errors: { 409: 'The review is already decided' } },

  // Site administration
  { method: 'get', path: '/api/admin/users', tag: 'Administration', access: 'admin', summary: 'Every account, its labs and admin flag', ok: { status: 200, description: '`{ users }`' } },
  { method: 'patch', path: '/api/admin/users/{user}', tag: 'Administration', access: 'admin', params: AdminUserParams, body: AdminUserBody, summary: 'Make an account a site administrator, or take that away', ok: { status: 200, description: '`{ user: { id, isAdmin } }`' }, errors: { 409: 'The last administrator' } },
  { method: 'get', path: '/api/admin/mail', tag: 'Administration', access: 'admin', summary: 'Captured mail (only with NUXT_MAIL_CAPTURE_DIR)', ok: { status: 200, description: '`{ messages }`' } },

  // This description
  { method: 'get', path: '/api/openapi.json', tag: 'About the API', access: 'anyone', summary: 'This description (OpenAPI 3.1)', ok: { status: 200, description: 'The OpenAPI document' } },
]
