/**
 * Every example in examples/ compiles and solves: converged, every mass and
 * charge balance closed to 1e-10 relative (re-verified in 40-digit arithmetic
 * by verify.ts), no non-suppressed solid supersaturated; with its sweep, every
 * point likewise. Also the CLI's JSON on one of them.
 */
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it, vi } from 'vitest'
import { runSolveCommand } from '../../../cli/solve'
import { solve, sweep } from '../../../server/solver/index'
// The compiler's own van 't Hoff (shared/poise/thermo.ts), not the solver's: the check stays independent.
import { vantHoff } from '../../../shared/poise/index'
import { compile } from '../../../shared/poise/index'
import type { Model } from '../../../shared/poise/model'
import type { Result } from '../../../shared/types/result'
import { hasNonFinite, verifyResult } from './verify'

const dir = join(__dirname, '../../../examples')
const files = readdirSync(dir).filter((f) => f.endsWith('.poise')).sort()

/** The model as solved at a sweep point (the swept variable replaced; constants moved by van 't Hoff for temperature). */
function atPoint(model: Model, value: number): Model {
  const sw = model.sweep!
  if (sw.variable === 'temperature') {
    const move = <F extends { logKRef: number; dH: number | null }>(f: F): F => ({ ...f, logK: vantHoff(f.logKRef, f.dH, value, model.refTemperatureC) })
    return { ...model, temperatureC: value, species: model.species.map(move), solids: model.solids.map(move), gases: model.gases.map(move) }
  }
  const components = model.components.map((c) => {
    if (sw.variable === 'pH' && c.name === 'H+') return { ...c, mode: 'pH' as const, value }
    if ((sw.variable === 'total' || sw.variable === 'pressure') && c.name === sw.component) return { ...c, value }
    return c
  })
  return { ...model, components }
}

function expectClosed(model: Model, r: Result): void {
  expect(r.converged, r.reason).toBe(true)
  expect(hasNonFinite(r)).toBe(false)
  expect(r.species.length).toBe(model.species.filter((s) => s.componentIndex === null || model.components[s.componentIndex].phase === 'aq').length)
  const v = verifyResult(model, r)
  expect(v.worstBalance, `balance of ${v.worstBalanceName}`).toBeLessThan(1e-10)
  expect(v.worstSupersaturation).toBeLessThanOrEqual(1e-8)
  expect(v.negativeAmount).toBe(false)
}

describe('examples', () => {
  it('has examples to check', () => expect(files.length).toBeGreaterThan(0))

  it.each(files)('%s solves with every balance closed', (file) => {
    const { model, diagnostics } = compile(readFileSync(join(dir, file), 'utf8'))
    expect(diagnostics.filter((d) => d.severity === 'error')).toEqual([])
    expectClosed(model!, solve(model!))
    if (model!.sweep) {
      const out = sweep(model!)
      expect(out.points).toHaveLength(model!.sweep.values.length)
      out.points.forEach((p, k) => {
        expectClosed(atPoint(model!, out.values[k]), p)
      })
    }
  }, 60_000)
})

describe('solve command', () => {
  it('prints the Result JSON of a file without a sweep', async () => {
    const file = files.map((f) => join(dir, f)).find((f) => {
      const model = compile(readFileSync(f, 'utf8')).model
      return model && !model.sweep && !model.titration && !model.map
    })!
    const lines: string[] = []
    const log = vi.spyOn(console, 'log').mockImplementation((s: string) => { lines.push(s) })
    const err = vi.spyOn(console, 'error').mockImplementation(() => {})
    const code = await runSolveCommand([file, '--json'])
    log.mockRestore(); err.mockRestore()
    expect(code).toBe(0)
    const result = JSON.parse(lines.join('\n')) as Result
    expect(result.converged).toBe(true)
    expect(typeof result.pH).toBe('number')
    expect(result.residuals.maxScaled).toBeLessThan(1e-10)
  })

  it('prints diagnostics as FILE:LINE:COL and exits 2 on compile errors', async () => {
    const { mkdtempSync, writeFileSync } = await import('node:fs')
    const { tmpdir } = await import('node:os')
    const file = join(mkdtempSync(join(tmpdir(), 'poise-')), 'bad.poise')
    writeFileSync(file, 'system "bad"\ncomponent Ca+2 total 1 mmol/L\n')
    const errors: string[] = []
    const err = vi.spyOn(console, 'error').mockImplementation((s: string) => { errors.push(s) })
    const log = vi.spyOn(console, 'log').mockImplementation(() => {})
    const code = await runSolveCommand([file])
    err.mockRestore(); log.mockRestore()
    expect(code).toBe(2)
    expect(errors.some((e) => new RegExp(`^${file.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}:2:\\d+: error \\w+: `).test(e))).toBe(true)
  })
})
