/**
 * The commands that work with a server: login, labs, systems, pull, push,
 * run, history. Each takes its parsed options and returns an exit code, or
 * throws a CliError (main.ts prints it).
 */
import type { LabListAnswer, RevisionAnswer, RevisionListAnswer, RevisionView, RunView, SystemAnswer, SystemListAnswer } from '../shared/types/system'
import { jobIsActive } from '../shared/types/job'
import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { Client, normaliseServer, parseTarget } from './client'
import { currentLogin, pulledRevision, rememberPull, saveLogin } from './config'
import { CliError, EXIT } from './exit-codes'
import type { Model } from '../shared/poise/model'

interface Me { user: { name: string, email: string } }
type Revision = RevisionView

const out = (text: string) => process.stdout.write(text.endsWith('\n') ? text : `${text}\n`)
const note = (text: string) => process.stderr.write(`${text}\n`)

/** Columns padded to their widest cell. */
function table(rows: string[][]): string {
  const widths = rows[0]!.map((_, i) => Math.max(...rows.map((r) => (r[i] ?? '').length)))
  return rows.map((r) => r.map((cell, i) => (i === r.length - 1 ? cell : cell.padEnd(widths[i]!))).join('  ').trimEnd()).join('\n')
}

function positiveInt(text: string | undefined, option: string): number | undefined {
  if (text === undefined) return undefined
  if (!/^[1-9]\d*$/.test(text)) throw new CliError(EXIT.badInput, `${option} takes a revision number such as 3, not "${text}"`)
  return Number(text)
}

async function readStdin(): Promise<string> {
  if (process.stdin.isTTY) process.stderr.write('Paste the API token (from the settings page) and press Enter: ')
  let text = ''
  for await (const chunk of process.stdin) {
    text += chunk
    if (process.stdin.isTTY && text.includes('\n')) break
  }
  return text
}

export async function login(options: { server?: string }): Promise<number> {
  if (!options.server) throw new CliError(EXIT.badInput, 'login needs --server URL, the address of your Equipoise site')
  const server = normaliseServer(options.server)
  const token = (process.env.EQUIPOISE_TOKEN || (await readStdin())).trim()
  if (!token) throw new CliError(EXIT.badInput, 'No token given: pipe it in (equipoise login --server URL < token.txt) or set EQUIPOISE_TOKEN')
  const me = await new Client({ server, token }).get<Me>('/api/me')
  const file = saveLogin({ server, token })
  out(`Logged in to ${server} as ${me.user.name} <${me.user.email}>; kept in ${file}`)
  return EXIT.ok
}

export async function labs(options: { json?: boolean }): Promise<number> {
  const { labs } = await new Client(currentLogin()).get<LabListAnswer>('/api/labs')
  if (options.json) out(JSON.stringify(labs, null, 2))
  else if (!labs.length) note('You are not a member of any lab.')
  else out(table([['LAB', 'ROLE', 'NAME'], ...labs.map((l) => [l.slug, l.role, l.name])]))
  return EXIT.ok
}

export async function systems(lab: string | undefined, options: { json?: boolean }): Promise<number> {
  if (!lab || lab.includes('/')) throw new CliError(EXIT.badInput, `systems takes a lab's short name (see \`equipoise labs\`)${lab ? `, not "${lab}"` : ''}`)
  const { systems } = await new Client(currentLogin()).get<SystemListAnswer>(`/api/labs/${encodeURIComponent(lab)}/systems`)
  if (options.json) out(JSON.stringify(systems, null, 2))
  else if (!systems.length) note(`${lab} has no systems yet.`)
  else out(table([['SYSTEM', 'REV', 'SAVED', 'TITLE'], ...systems.map((s) => [
    `${lab}/${s.slug}`, String(s.latestRevision ?? ''), s.updatedAt?.slice(0, 16).replace('T', ' ') ?? '', s.title + (s.isLibrary ? ' (library)' : ''),
  ])]))
  return EXIT.ok
}

async function fetchRevision(client: Client, path: string, number: number | undefined): Promise<Revision> {
  if (number === undefined) return (await client.get<SystemAnswer>(path)).system.latest
  return (await client.get<RevisionAnswer>(`${path}/revisions/${number}`)).revision
}

export async function pull(target: string | undefined, options: { revision?: string, output?: string }): Promise<number> {
  const { path } = parseTarget(target)
  const number = positiveInt(options.revision, '--revision')
  const client = new Client(currentLogin())
  const revision = await fetchRevision(client, path, number)
  if (!options.output || options.output === '-') {
    process.stdout.write(revision.source)
    return EXIT.ok
  }
  writeFileSync(options.output, revision.source)
  rememberPull(options.output, { server: client.server, target: target!, revision: revision.number })
  note(`Wrote revision ${revision.number} of ${target} to ${options.output}`)
  return EXIT.ok
}

export async function push(file: string | undefined, target: string | undefined, options: { message?: string, base?: string }): Promise<number> {
  if (!file) throw new CliError(EXIT.badInput, 'push needs a file and a system: equipoise push FILE LAB/SYSTEM -m MESSAGE')
  const { path } = parseTarget(target)
  if (!options.message?.trim()) throw new CliError(EXIT.badInput, 'push needs -m MESSAGE saying what changed (it goes into the history)')
  if (!existsSync(file)) throw new CliError(EXIT.badInput, `${file}: no such file`)
  const source = readFileSync(file, 'utf8')
  const client = new Client(currentLogin())
  let base = positiveInt(options.base, '--base') ?? pulledRevision(file, client.server, target!)
  if (base === undefined) {
    base = (await fetchRevision(client, path, undefined)).number
    note(`${file} was not pulled from ${target}: saving over its latest revision ${base} (give --base N to be told when someone saved since N)`)
  }
  const answer = await client.request<{ system: { latest: Revision } }>('PATCH', path, { source, message: options.message.trim(), baseRevision: base }, (error) => {
    if (error.status !== 409) return undefined
    const latest = error.data?.latestRevision ?? '?'
    return new CliError(EXIT.conflict, `Conflict: revision ${latest} of ${target} was saved after revision ${base}, which you edited. Nothing was saved. `
      + `Pull it (equipoise pull ${target} -o OTHER_FILE), bring your change into it, and push again with --base ${latest}.`)
  })
  const saved = answer.system.latest
  rememberPull(file, { server: client.server, target: target!, revision: saved.number })
  out(`Saved ${file} as revision ${saved.number} of ${target}`)
  return EXIT.ok
}

/** GET …/runs/:id answers with the run's model, and its result once the job ended (null before). */
type RunAnswer = RunView & { model: Model | null }

export async function run(target: string | undefined, options: { revision?: string, json?: boolean, units?: string, asElement?: boolean }): Promise<number> {
  const { lab, path } = parseTarget(target)
  const number = positiveInt(options.revision, '--revision')
  const { checkUnit, formatRun } = await import('./run-format')
  const unit = checkUnit(options.units)
  const client = new Client(currentLogin())
  const queued = await client.request<RunAnswer>('POST', `${path}/runs`, number === undefined ? {} : { revision: number })
  const stored = await waitForRun(client, `${path}/runs/${queued.id}`, queued)
  if (stored.jobStatus === 'failed') throw new CliError(EXIT.failed, `Run ${stored.number} of ${target} failed: ${stored.jobError ?? 'no reason given'}`)
  const code = stored.status === 'ok' && stored.jobStatus === 'done' ? EXIT.ok : EXIT.failed
  if (options.json) {
    out(JSON.stringify(stored, null, 2))
    return code
  }
  const revision = await fetchRevision(client, path, stored.revision)
  const libraries = new Map<string, { source: string, revision: number }>()
  for (const used of stored.model ? [] : stored.libraries) {
    const text = await client.get<{ source: string }>(`/api/labs/${encodeURIComponent(lab)}/libraries/${encodeURIComponent(used.name)}/revisions/${used.revision}`)
    libraries.set(used.name, { source: text.source, revision: used.revision })
  }
  note(`Run ${stored.number} of ${target}, revision ${stored.revision}: ${stored.jobStatus === 'cancelled' ? `cancelled after ${stored.progress.done} of ${stored.progress.total} points` : stored.status}`)
  if (!stored.result) return code
  out(formatRun(revision.source, libraries, { ...stored, result: stored.result }, { unit, asElement: Boolean(options.asElement) }))
  return code
}

/** How often `run` asks how far a queued run has got. */
const RUN_POLL_MS = 500

/** Waits for a queued run to end (a worker solves it), saying how far it got on stderr; answers the run with its result. */
async function waitForRun(client: Client, path: string, run: RunAnswer): Promise<RunAnswer> {
  let said = ''
  while (jobIsActive(run.jobStatus)) {
    await new Promise((r) => setTimeout(r, RUN_POLL_MS))
    run = await client.get<RunAnswer>(path)
    const { done, total } = run.progress
    const now = run.jobStatus === 'queued' ? `Run ${run.number} is queued` : `Run ${run.number}: ${done} of ${total} points`
    if (total > 1 && now !== said && process.stderr.isTTY) note(now)
    said = now
  }
  return run
}

export async function history(target: string | undefined, options: { json?: boolean }): Promise<number> {
  const { path } = parseTarget(target)
  const answer = await new Client(currentLogin()).get<RevisionListAnswer>(`${path}/revisions`)
  if (options.json) out(JSON.stringify(answer.revisions, null, 2))
  else out(table([['REV', 'SAVED (UTC)', 'AUTHOR', 'RUN', 'MESSAGE'], ...answer.revisions.map((r) => [
    String(r.number), r.createdAt.slice(0, 16).replace('T', ' '), r.author ?? '—', r.run?.status ?? '—', r.message,
  ])]))
  return EXIT.ok
}
