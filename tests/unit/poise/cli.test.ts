import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { CLEAN } from './helpers'

const root = new URL('../../../', import.meta.url).pathname
const tsx = join(root, 'node_modules/.bin/tsx')

function run(args: string[]): { code: number; stdout: string; stderr: string } {
  try {
    const stdout = execFileSync(tsx, ['scripts/cli.ts', ...args], { cwd: root, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] })
    return { code: 0, stdout, stderr: '' }
  } catch (e) {
    const err = e as { status: number; stdout: string; stderr: string }
    return { code: err.status, stdout: err.stdout, stderr: err.stderr }
  }
}

const dir = mkdtempSync(join(tmpdir(), 'poise-cli-'))
const file = (name: string, text: string) => { const p = join(dir, name); writeFileSync(p, text); return p }

describe('cli check', { timeout: 60_000 }, () => {
  it('exits 0 on a correct file and prints nothing', () => {
    const r = run(['check', file('ok.poise', CLEAN)])
    expect(r.code).toBe(0)
    expect(r.stdout).toBe('')
  })
  it('exits 2 on an unbalanced reaction and a wrong constant kind, with FILE:LINE:COL lines', () => {
    const p = file('bad.poise', CLEAN + 'reaction Cu^2+ + Cl- <=> CuCl logK 0.4 cite "x"\nreaction Cu^2+ + Cl- <=> CuCl+ pKa 0.4 cite "x"\n')
    const r = run(['check', p])
    expect(r.code).toBe(2)
    expect(r.stdout).toContain(`${p}:8:10: error P021:`)
    expect(r.stdout).toContain(`${p}:9:32: error P040:`)
  })
  it('prints JSON with --json', () => {
    const r = run(['check', file('warn.poise', CLEAN.replace(' cite "hydrolysis (from memory)"', '')), '--json'])
    expect(r.code).toBe(0)
    const out = JSON.parse(r.stdout) as { diagnostics: { code: string; range: { line: number } }[] }
    expect(out.diagnostics.map((d) => [d.code, d.range.line])).toEqual([['W105', 6]])
  })
  it('exits 2 with a clear message for a missing file or no command', () => {
    const missing = run(['check', join(dir, 'nope.poise')])
    expect(missing.code).toBe(2)
    expect(missing.stderr).toContain('no such file')
    const usage = run([])
    expect(usage.code).toBe(2)
    expect(usage.stderr).toContain('usage:')
  })
})
