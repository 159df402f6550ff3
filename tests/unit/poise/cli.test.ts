import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { CLEAN } from './helpers'
import type { Result, SweepResult } from '../../../shared/types/result'

const root = new URL('../../../', import.meta.url).pathname

// The command as users run it: the bundle (built from the current source) through bin/equipoise.mjs.
await (await import('../../../scripts/build-cli.mjs')).buildCli()

function run(args: string[]): { code: number; stdout: string; stderr: string } {
  try {
    const stdout = execFileSync(process.execPath, ['bin/equipoise.mjs', ...args], { cwd: root, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] })
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

describe('cli solve --units', { timeout: 120_000 }, () => {
  // The shipped nickel rinse at one pH (no sweep), so the tables hold one answer.
  const text = readFileSync(join(root, 'examples/nickel-rinse-discharge.poise'), 'utf8').replace(/^sweep .*$/m, '').replace('pH 8', 'pH 10')
  const p = file('nickel.poise', text)
  const json = run(['solve', p, '--json'])
  const result = JSON.parse(json.stdout) as Result

  it('prints the tables in mg/L with IUPAC molar masses; the JSON stays in mol/L', () => {
    expect(json.code).toBe(0)
    const r = run(['solve', p, '--units', 'mg/L'])
    expect(r.code).toBe(0)
    const header = r.stdout.split('\n').find((l) => l.startsWith('species'))!
    expect(header).toMatch(/^species\s+mg\/L\s+log10 mol\/L/)
    // Ni2+ in mg/L = mol/L × 58.693 g/mol (IUPAC, Standard atomic weights 2021) × 1000 mg/g.
    const ni = result.species.find((s) => s.name === 'Ni^2+')!.concentration
    const line = r.stdout.split('\n').find((l) => l.startsWith('Ni^2+ '))!
    expect(Number(line.trim().split(/\s+/)[1])).toBeCloseTo(ni * 58.693e3, 3 - Math.floor(Math.log10(ni * 58.693e3)))
    // The JSON is unchanged by --units.
    expect(JSON.parse(run(['solve', p, '--json', '--units', 'mg/L']).stdout)).toEqual(result)
  })

  it('counts ammonia as N with --as-element, and names dissolved Ni apart from the free ion', () => {
    const r = run(['solve', p, '--units', 'mg/L', '--as-element'])
    // The component table's row (the species table has an NH3 row too).
    const line = r.stdout.split('\n').find((l) => /^NH3\s+total\s/.test(l))!
    expect(line).toContain('mg/L as N')
    // 20 mmol/L NH3 × 14.007 g/mol N (IUPAC, Standard atomic weights 2021) = 280.14 mg/L as N.
    expect(line).toMatch(/2\.801e\+2/)
    expect(r.stdout).toContain('(dissolved Ni)')
  })

  it('refuses a unit it does not know, saying which it takes', () => {
    const r = run(['solve', p, '--units', 'ppm'])
    expect(r.code).toBe(2)
    expect(r.stderr).toContain('--units takes one of mol/L, mmol/L, µmol/L, mg/L, µg/L, not ppm')
  })
})

describe('cli solve of a sweep with a limit', { timeout: 120_000 }, () => {
  const p = join(root, 'examples/nickel-rinse-discharge.poise')

  it('states the window in words under the table, and gives it in the JSON', () => {
    const json = JSON.parse(run(['solve', p, '--json']).stdout) as SweepResult
    expect(json.limits).toHaveLength(1)
    const [[from, to]] = json.limits![0]!.ranges
    const text = run(['solve', p, '--units', 'mg/L'])
    expect(text.code).toBe(0)
    expect(text.stdout).toContain(`limit: dissolved Ni ≤ 1 mg/L from pH ${from!.toFixed(2)} to ${to!.toFixed(2)}`)
    expect(text.stdout).toMatch(/dissolved Ni mg\/L/)
  })
})

describe('cli solve on a map', { timeout: 120_000 }, () => {
  const text = readFileSync(join(root, 'examples/copper-hydroxide-carbonate-map.poise'), 'utf8')
    .replace(/^map .*$/m, 'map pH from 4 to 10 points 4 by total Cu^2+ from 1e-5 to 1e-3 mol/L points 3 log')
  const p = file('copper-map.poise', text)

  it('prints { x: {variable, values}, y: {variable, values}, points: [row per y: [Result per x]] } with --json', () => {
    const r = run(['solve', p, '--json'])
    expect(r.code).toBe(0)
    const out = JSON.parse(r.stdout) as { x: { variable: string; component: string | null; values: number[] }; y: { variable: string; component: string | null; values: number[] }; points: Result[][] }
    expect(Object.keys(out)).toEqual(['x', 'y', 'points'])
    expect(out.x).toMatchObject({ variable: 'pH', values: [4, 6, 8, 10] })
    expect(out.y).toMatchObject({ variable: 'total', component: 'Cu^2+', values: [1e-5, 1e-4, 1e-3] })
    expect(out.points).toHaveLength(3)
    for (const [i, row] of out.points.entries()) {
      expect(row).toHaveLength(4)
      for (const [j, cell] of row.entries()) {
        expect(cell.converged).toBe(true)
        expect(cell.pH).toBeCloseTo(out.x.values[j]!, 9)
        // Copper's total is the row's y value (dissolved plus what a solid holds).
        const copper = cell.components.find((c) => c.name === 'Cu^2+')!
        expect(copper.total).toBeCloseTo(out.y.values[i]!, 15)
      }
    }
  })

  it('prints one line a cell without --json, both axes first', () => {
    const r = run(['solve', p])
    expect(r.code).toBe(0)
    expect(r.stdout).toContain('map over pH (4 points) by total Cu^2+ (3 points)')
    const rows = r.stdout.split('\n').filter((l) => /^\d/.test(l))
    expect(rows).toHaveLength(12)
    expect(rows[0]!.trim().split(/\s+/).slice(0, 3)).toEqual(['0.00001', '4', '4.000'])
  })
})
