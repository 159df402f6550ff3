/**
 * Command line: `check FILE.poise [--json]` prints diagnostics; `solve` is
 * handed to the solver's own CLI module. Exit 0 without errors, 2 otherwise.
 */
import { readFileSync, existsSync } from 'node:fs'
import { pathToFileURL } from 'node:url'
import { resolve, dirname } from 'node:path'
import { compile } from '../shared/poise/index'

const USAGE = 'usage: npm run -s cli -- check FILE.poise [--json]\n       npm run -s cli -- solve FILE.poise [--json] [--units UNIT] [--as-element]'

function check(args: string[]): number {
  const json = args.includes('--json')
  const files = args.filter((a) => a !== '--json')
  if (files.length === 0) { console.error(`check needs a file.\n${USAGE}`); return 2 }
  let worst = 0
  const report: { file: string; diagnostics: unknown[] }[] = []
  for (const file of files) {
    if (!existsSync(file)) { console.error(`${file}: no such file`); worst = 2; continue }
    const result = compile(readFileSync(file, 'utf8'))
    if (result.diagnostics.some((d) => d.severity === 'error')) worst = 2
    if (json) report.push({ file, diagnostics: result.diagnostics })
    else for (const d of result.diagnostics) console.log(`${file}:${d.range.line}:${d.range.column}: ${d.severity} ${d.code}: ${d.message}`)
  }
  if (json) console.log(JSON.stringify(files.length === 1 ? report[0] ?? {} : report, null, 2))
  return worst
}

async function solve(args: string[]): Promise<number> {
  const solverCli = resolve(dirname(new URL(import.meta.url).pathname), '../server/solver/cli.ts')
  if (!existsSync(solverCli)) { console.error('solve is not available yet: server/solver/cli.ts is missing'); return 2 }
  const mod = (await import(pathToFileURL(solverCli).href)) as { runSolveCommand?: (a: string[]) => Promise<number> }
  if (typeof mod.runSolveCommand !== 'function') { console.error('server/solver/cli.ts does not export runSolveCommand'); return 2 }
  return mod.runSolveCommand(args)
}

async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv
  if (command === 'check') return check(rest)
  if (command === 'solve') return solve(rest)
  console.error(command ? `unknown command '${command}'.\n${USAGE}` : USAGE)
  return 2
}

main(process.argv.slice(2)).then((code) => { process.exitCode = code }, (e) => { console.error(e instanceof Error ? e.message : String(e)); process.exitCode = 2 })
