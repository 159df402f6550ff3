/**
 * `equipoise fit FILE.poise DATA.csv [--json]` as users run it: the bundle
 * through bin/equipoise.mjs, its JSON contract, its table and its refusals.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { compile } from '../../../shared/poise/index'
import type { TitrationCurveResult } from '../../../shared/types/result'
import { titration } from '../../../server/solver/index'

const root = new URL('../../../', import.meta.url).pathname
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

const dir = mkdtempSync(join(tmpdir(), 'poise-fit-'))
const file = (name: string, text: string) => { const p = join(dir, name); writeFileSync(p, text); return p }

const acid = (pKa: string, mark: string) => `system "A weak acid titrated with caustic"
activity ideal
component H+        balance
component CH3COO-   total 10 mmol/L
component Na+       total 0 mol/L
reaction H2O <=> H+ + OH-           pKw 14.00  cite "from memory"
reaction CH3COOH  <=>  CH3COO- + H+   pKa ${pKa} ${mark}  cite "invented for this test"
sample volume 50 mL
titrant Na+ 0.1 mol/L
titrant OH- 0.1 mol/L
titrate from 0 to 8 mL step 0.5
`

// Data from the true pKa 4.76 with a fixed alternating error of ±0.005 (mean 0).
const volumes = Array.from({ length: 20 }, (_, i) => 0.3 * (i + 1))
const truth = compile(acid('4.76', '')).model!
const curve = titration({ ...truth, titration: { ...truth.titration!, values: volumes, targetPH: null } }) as TitrationCurveResult
const csv = file('acid.csv', 'volume mL,pH\n' + volumes.map((v, i) => `${v.toFixed(1)},${(curve.points[i]!.pH + (i % 2 ? 0.005 : -0.005)).toFixed(4)}`).join('\n') + '\n')

describe('cli fit', { timeout: 120_000 }, () => {
  it('prints the contract JSON with --json: the reaction as written, its kind and the value in that kind', () => {
    const r = run(['fit', file('acid.poise', acid('4.40', 'fit')), csv, '--json'])
    expect(r.stderr).toBe('')
    expect(r.code).toBe(0)
    const out = JSON.parse(r.stdout)
    expect(Object.keys(out)).toEqual(expect.arrayContaining(['converged', 'iterations', 'points', 'degreesOfFreedom', 'residualStandardDeviation', 'constants', 'correlation']))
    expect(out.converged).toBe(true)
    expect(out.iterations).toBeGreaterThan(0)
    expect(out.points).toBe(20)
    expect(out.degreesOfFreedom).toBe(19)
    expect(out.residualStandardDeviation).toBeGreaterThan(0.003)
    expect(out.residualStandardDeviation).toBeLessThan(0.01)
    expect(out.constants).toHaveLength(1)
    const [c] = out.constants
    expect(c).toMatchObject({ reaction: 'CH3COOH <=> CH3COO- + H+', kind: 'pKa' })
    expect(c.value).toBeCloseTo(4.76, 1)
    expect(Math.abs(c.value - 4.76)).toBeLessThan(3 * c.standardError)
    expect(out.correlation).toEqual([[1]])
  })
  it('prints a table without --json', () => {
    const r = run(['fit', file('acid2.poise', acid('4.40', 'fit')), csv])
    expect(r.code).toBe(0)
    expect(r.stdout).toMatch(/^Converged after \d+ iterations?: 1 constant fitted to 20 measured values \(19 degrees of freedom\)\./)
    expect(r.stdout).toMatch(/1 +CH3COOH <=> CH3COO- \+ H\+ +pKa +4\.7\d+ +± 0\.0\d+ +4\.4/)
    expect(r.stdout).toContain('Residual standard deviation s = ')
  })
  it('exits 2 with the data file\'s line and column for a bad cell, and with a message when nothing is marked fit', () => {
    const bad = run(['fit', file('acid3.poise', acid('4.40', 'fit')), file('bad.csv', 'volume mL,pH\n1,4.1\n2,four\n')])
    expect(bad.code).toBe(2)
    expect(bad.stderr).toContain('bad.csv:3:2: error: "four" in pH is not a number')
    const none = run(['fit', file('acid4.poise', acid('4.40', '')), csv])
    expect(none.code).toBe(2)
    expect(none.stderr).toContain('No constant is marked to fit')
    const weight = run(['fit', file('acid5.poise', acid('4.40', 'fit')), csv, '--weight', 'log H+=2'])
    expect(weight.code).toBe(2)
    expect(weight.stderr).toContain('--weight names log H+, not a measured column')
  })
})
