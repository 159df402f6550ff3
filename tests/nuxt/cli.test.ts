/**
 * The `equipoise` command (the built bundle, as users run it) against the
 * built server: login, pull → edit → push → run → history, a stale push
 * (exit 3, naming the latest revision), a read token that cannot push
 * (exit 4), and what a token of a non-member sees.
 */
import { spawn } from 'node:child_process'
import { mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { url } from '@nuxt/test-utils/e2e'
import { beforeAll, describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp, type SignedIn } from '../setup/accounts'

await useBuiltServer()
await (await import('../../scripts/build-cli.mjs')).buildCli()

const root = new URL('../../', import.meta.url).pathname
const dir = mkdtempSync(join(tmpdir(), 'equipoise-cli-'))
// The shipped copper rinse at one pH (its sweep taken out), so a run has one answer.
const SOURCE = readFileSync(join(root, 'examples/copper-rinse-tank.poise'), 'utf8').replace(/^sweep .*$/m, '')

/** Runs the command (asynchronously, so this process keeps serving its own connections meanwhile). */
function cli(args: string[], env: Record<string, string> = {}, input = ''): Promise<{ code: number | null, stdout: string, stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [join(root, 'bin/equipoise.mjs'), ...args], {
      cwd: dir,
      env: { PATH: process.env.PATH, HOME: dir, EQUIPOISE_CONFIG_DIR: join(dir, 'config'), ...env },
    })
    let stdout = ''
    let stderr = ''
    child.stdout.setEncoding('utf8').on('data', (d: string) => { stdout += d })
    child.stderr.setEncoding('utf8').on('data', (d: string) => { stderr += d })
    child.on('error', reject)
    child.on('close', (code) => resolve({ code, stdout, stderr }))
    child.stdin.end(input)
  })
}

async function makeToken(who: SignedIn, scope: 'read' | 'write'): Promise<string> {
  const answer = await api('/api/me/tokens', { method: 'POST', cookie: who.cookie, body: { name: `cli ${scope}`, scope } })
  expect(answer.status).toBe(201)
  return answer.body.token
}

let owner: SignedIn
let lab: string
let writeToken: string
let readToken: string
let server: string

beforeAll(async () => {
  owner = await signUp('cli-owner')
  lab = await makeLab(owner)
  const created = await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: owner.cookie, body: { title: 'Rinse', slug: 'rinse', source: SOURCE } })
  expect(created.status).toBe(201)
  writeToken = await makeToken(owner, 'write')
  readToken = await makeToken(owner, 'read')
  server = url('/')
})

describe('equipoise against the server', () => {
  it('logs in with a token from stdin and keeps it in a file only the user can read', async () => {
    const login = await cli(['login', '--server', server], {}, `${writeToken}\n`)
    expect(login.stderr).toBe('')
    expect(login.code).toBe(0)
    expect(login.stdout).toContain(`as Test cli-owner <${owner.user.email}>`)
    const file = join(dir, 'config', 'login.json')
    expect(statSync(file).mode & 0o777).toBe(0o600)
    expect(JSON.parse(readFileSync(file, 'utf8'))).toEqual({ server: server.replace(/\/$/, ''), token: writeToken })
    const labs = await cli(['labs'])
    expect(labs.code).toBe(0)
    expect(labs.stdout).toMatch(new RegExp(`^${lab}\\s+owner\\s+Lab ${lab}$`, 'm'))
    const systems = await cli(['systems', lab])
    expect(systems.stdout).toMatch(new RegExp(`^${lab}/rinse\\s+1\\s+.*Rinse$`, 'm'))

    const refused = await cli(['login', '--server', server], {}, 'eqp_wrong\n')
    expect(refused.code).toBe(4)
    expect(refused.stderr).toMatch(/not known/)
  })

  it('pulls, pushes an edit as the next revision, runs it as the workbench would, and lists the history', async () => {
    const env = { EQUIPOISE_SERVER: server, EQUIPOISE_TOKEN: writeToken }
    const file = join(dir, 'rinse.poise')
    const pulled = await cli(['pull', `${lab}/rinse`, '-o', file], env)
    expect(pulled.code).toBe(0)
    expect(readFileSync(file, 'utf8')).toBe(SOURCE)
    const edited = SOURCE.replace('component Cu^2+  total 1.5 mmol/L', 'component Cu^2+  total 2.5 mmol/L')
    expect(edited).not.toBe(SOURCE)
    writeFileSync(file, edited)
    const pushed = await cli(['push', file, `${lab}/rinse`, '-m', 'More copper'], env)
    expect(pushed.stderr).toBe('')
    expect(pushed.code).toBe(0)
    expect(pushed.stdout).toContain('revision 2')
    const stored = await api(`/api/labs/${lab}/systems/rinse`, { cookie: owner.cookie })
    expect(stored.body.system.latest).toMatchObject({ number: 2, source: edited, message: 'More copper' })

    const run = await cli(['run', `${lab}/rinse`, '--json'], env)
    expect(run.code).toBe(0)
    const answer = JSON.parse(run.stdout)
    expect(answer).toMatchObject({ revision: 2, status: 'ok', kind: 'single' })
    // The very run the workbench opens with (the newest of the latest revision), with the same result.
    const runs = await api(`/api/labs/${lab}/systems/rinse/runs`, { cookie: owner.cookie })
    expect(runs.body.runs[0].id).toBe(answer.id)
    const inBrowser = await api(`/api/labs/${lab}/systems/rinse/runs/${answer.id}`, { cookie: owner.cookie })
    expect(answer.result).toEqual(inBrowser.body.result)
    const total = answer.result.components.find((c: { name: string }) => c.name === 'Cu^2+').total
    expect(total).toBeCloseTo(2.5e-3, 12)

    const tables = await cli(['run', `${lab}/rinse`, '--units', 'mmol/L'], env)
    expect(tables.code).toBe(0)
    expect(tables.stderr).toMatch(/revision 2: ok/)
    expect(tables.stdout).toContain('Rinse tank after a copper ammonia etch')
    expect(tables.stdout).toMatch(/mmol\/L/)

    const history = await cli(['history', `${lab}/rinse`], env)
    expect(history.code).toBe(0)
    expect(history.stdout.split('\n')[1]).toMatch(/^2\s+\S+ \S+\s+Test cli-owner\s+ok\s+More copper$/)
  })

  it('refuses a push from a stale base with exit 3, naming the latest revision, and saves nothing', async () => {
    const env = { EQUIPOISE_SERVER: server, EQUIPOISE_TOKEN: writeToken }
    const before = (await api(`/api/labs/${lab}/systems/rinse`, { cookie: owner.cookie })).body.system.latest.number as number
    const file = join(dir, 'stale.poise')
    writeFileSync(file, SOURCE.replace('pKw 14.00', 'pKw 13.99'))
    const stale = await cli(['push', file, `${lab}/rinse`, '-m', 'From an old copy', '--base', '1'], env)
    expect(stale.code).toBe(3)
    expect(stale.stderr).toContain(`revision ${before} of ${lab}/rinse was saved after revision 1`)
    expect(stale.stderr).toContain(`--base ${before}`)
    expect((await api(`/api/labs/${lab}/systems/rinse`, { cookie: owner.cookie })).body.system.latest.number).toBe(before)

    // A file pulled before someone else saved is stale too, without --base.
    const mine = join(dir, 'mine.poise')
    expect((await cli(['pull', `${lab}/rinse`, '-o', mine], env)).code).toBe(0)
    const theirs = join(dir, 'theirs.poise')
    expect((await cli(['pull', `${lab}/rinse`, '-o', theirs], env)).code).toBe(0)
    writeFileSync(theirs, `${readFileSync(theirs, 'utf8')}\n# theirs\n`)
    expect((await cli(['push', theirs, `${lab}/rinse`, '-m', 'Theirs'], env)).code).toBe(0)
    writeFileSync(mine, `${readFileSync(mine, 'utf8')}\n# mine\n`)
    const late = await cli(['push', mine, `${lab}/rinse`, '-m', 'Mine'], env)
    expect(late.code).toBe(3)
    expect(late.stderr).toContain(`revision ${before + 1} of ${lab}/rinse`)
  })

  it('exits 4 when a read token pushes or runs, or no login is kept; 2 for a lab of others or bad input', async () => {
    const env = { EQUIPOISE_SERVER: server, EQUIPOISE_TOKEN: readToken }
    const file = join(dir, 'read.poise')
    expect((await cli(['pull', `${lab}/rinse`, '-o', file], env)).code).toBe(0)
    const push = await cli(['push', file, `${lab}/rinse`, '-m', 'Nope'], env)
    expect(push.code).toBe(4)
    expect(push.stderr).toMatch(/may only read/)
    expect((await cli(['run', `${lab}/rinse`], env)).code).toBe(4)

    const nobody = await cli(['labs'], { EQUIPOISE_CONFIG_DIR: join(dir, 'empty') })
    expect(nobody.code).toBe(4)
    expect(nobody.stderr).toMatch(/equipoise login --server URL/)

    const stranger = await signUp('cli-stranger')
    const strangerEnv = { EQUIPOISE_SERVER: server, EQUIPOISE_TOKEN: await makeToken(stranger, 'write') }
    const hidden = await cli(['pull', `${lab}/rinse`], strangerEnv)
    expect(hidden.code).toBe(2)
    expect(hidden.stderr).toContain(`No lab "${lab}" that you are a member of`)

    expect((await cli(['pull', 'no-slash'], env)).code).toBe(2)
    expect((await cli(['push', file, `${lab}/rinse`], env)).stderr).toMatch(/-m MESSAGE/)
    expect((await cli(['pull', `${lab}/rinse`, '--revision', 'two'], env)).code).toBe(2)
    expect((await cli(['pull', `${lab}/rinse`, '--frobnicate'], env)).code).toBe(2)
  })

  it('has --help for every command', async () => {
    for (const command of ['check', 'solve', 'login', 'labs', 'systems', 'pull', 'push', 'run', 'history']) {
      const help = await cli([command, '--help'])
      expect(help.code).toBe(0)
      expect(help.stdout).toMatch(new RegExp(`^usage: equipoise ${command}\\b`))
    }
    const overview = await cli(['--help'])
    expect(overview.stdout).toContain('0 ok, 1 failed, 2 bad input or diagnostics, 3 conflict, 4 not allowed')
  })
})
