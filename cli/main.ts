/**
 * `equipoise`, the command line: local `check`, `solve` and `fit`, and `login`,
 * `labs`, `systems`, `pull`, `push`, `run`, `history` against a server with
 * an API token. Bundled by scripts/build-cli.mjs into dist/equipoise.mjs
 * (bin/equipoise.mjs runs it); the language and solver are loaded only by
 * the commands that need them, so the remote commands start quickly.
 * Exit codes: exit-codes.ts.
 */
import { parseArgs, type ParseArgsConfig } from 'node:util'
import { CliError, EXIT } from './exit-codes'

type Options = NonNullable<ParseArgsConfig['options']>
type Values = Record<string, string | boolean | undefined>

interface Command {
  usage: string
  summary: string
  details: string
  options: Options
  /** How many positional arguments: [min, max] (max Infinity for any). */
  positionals: [number, number]
  run(positionals: string[], values: Values, raw: string[]): Promise<number> | number
}

const JSON_OPTION = { json: { type: 'boolean' } } as const satisfies Options

const COMMANDS: Record<string, Command> = {
  check: {
    usage: 'check FILE.poise… [--json]',
    summary: 'check Poise files and print their diagnostics',
    details: 'Prints FILE:LINE:COLUMN: severity CODE: message for each diagnostic (nothing for a clean file); --json prints them as JSON.\nExit 0 without errors, 2 with an error or a missing file.',
    options: JSON_OPTION,
    positionals: [1, Infinity],
    async run(files, values) {
      const { check } = await import('./local')
      return check(files, Boolean(values.json))
    },
  },
  solve: {
    usage: 'solve FILE.poise [--json] [--units UNIT] [--as-element]',
    summary: 'solve a Poise file here and print its tables (or the Result as JSON)',
    details: '--units sets the unit of the tables (mol/L, mmol/L, µmol/L or umol/L, mg/L, µg/L or ug/L); --as-element counts components in a mass unit as their element. --json prints the Result as the solver wrote it, in mol/L.\nExit 0 solved, 1 did not converge (a sweep: some point did not), 2 a missing file or diagnostics with errors (on stderr).',
    options: { ...JSON_OPTION, units: { type: 'string' }, 'as-element': { type: 'boolean' } },
    positionals: [1, 1],
    async run(_files, _values, raw) {
      const { runSolveCommand } = await import('./local')
      return runSolveCommand(raw)
    },
  },
  fit: {
    usage: 'fit FILE.poise DATA.csv [--json] [--weight COLUMN=W]…',
    summary: 'fit the constants FILE marks `fit` to the measurements in DATA',
    details: 'DATA is a CSV: the first column the study variable (volume mL, volume L, pH, or total X UNIT), each further column a measurement (pH, X UNIT, log X, dissolved X UNIT). Prints each fitted constant with its standard error, the correlations and the residual standard deviation; --json prints them as JSON. --weight "pH=2" weighs a column (1 by default, in its own units).\nExit 0 converged, 1 not converged, 2 a missing file, errors in FILE, problems in DATA (DATA:LINE:COLUMN on stderr) or nothing to fit.',
    options: { ...JSON_OPTION, weight: { type: 'string', multiple: true } },
    positionals: [2, 2],
    async run([file, data], values) {
      const { runFit } = await import('./fit')
      return runFit(file!, data!, { json: Boolean(values.json), weights: (values.weight as unknown as string[] | undefined) ?? [] })
    },
  },
  login: {
    usage: 'login --server URL',
    summary: 'keep the server and an API token for the other commands',
    details: 'Reads the token from EQUIPOISE_TOKEN or from standard input (make it on the settings page of the site), checks it with the server, and keeps both in login.json in your configuration folder (~/.config/equipoise, readable only by you).\nExit 0 logged in, 2 a bad address or no token, 4 the server refused the token.',
    options: { server: { type: 'string' } },
    positionals: [0, 0],
    async run(_p, values) {
      return (await import('./remote')).login({ server: values.server as string | undefined })
    },
  },
  labs: {
    usage: 'labs [--json]',
    summary: 'list your labs and your role in each',
    details: 'Exit 0, or 4 when not logged in or the token is refused.',
    options: JSON_OPTION,
    positionals: [0, 0],
    async run(_p, values) {
      return (await import('./remote')).labs({ json: Boolean(values.json) })
    },
  },
  systems: {
    usage: 'systems LAB [--json]',
    summary: "list a lab's systems with their latest revision",
    details: 'Exit 0; 2 no such lab (or you are not a member); 4 not allowed.',
    options: JSON_OPTION,
    positionals: [1, 1],
    async run([lab], values) {
      return (await import('./remote')).systems(lab, { json: Boolean(values.json) })
    },
  },
  pull: {
    usage: 'pull LAB/SYSTEM [--revision N] [-o FILE]',
    summary: "write a system's text (latest revision, or N) to FILE or standard output",
    details: 'With -o FILE the revision is remembered, so a later `push FILE` knows which revision you edited.\nExit 0; 2 no such lab, system or revision; 4 not allowed.',
    options: { revision: { type: 'string' }, output: { type: 'string', short: 'o' } },
    positionals: [1, 1],
    async run([target], values) {
      return (await import('./remote')).pull(target, { revision: values.revision as string | undefined, output: values.output as string | undefined })
    },
  },
  push: {
    usage: 'push FILE LAB/SYSTEM -m MESSAGE [--base N]',
    summary: 'save FILE as the next revision of a system',
    details: 'The revision you edited is --base N, or the one FILE was pulled as (or last pushed as); when a newer revision was saved since, nothing is saved and the command says which revision is the latest. Without either, the file is saved over the latest revision.\nNeeds a write token and the editor role. Exit 0 saved; 2 bad input; 3 conflict (a newer revision exists); 4 not allowed.',
    options: { message: { type: 'string', short: 'm' }, base: { type: 'string' } },
    positionals: [2, 2],
    async run([file, target], values) {
      return (await import('./remote')).push(file, target, { message: values.message as string | undefined, base: values.base as string | undefined })
    },
  },
  run: {
    usage: 'run LAB/SYSTEM [--revision N] [--json] [--units UNIT] [--as-element]',
    summary: 'run a saved revision on the server (stored, as the Run button does) and print its tables',
    details: 'Runs the latest revision, or N; the run is stored in the system\'s history and its answer is the one the workbench shows. --json prints the stored run with its Result; --units and --as-element as for solve.\nNeeds a write token (a run is stored). Exit 0 converged, 1 did not converge, 2 no such system or revision, 4 not allowed.',
    options: { revision: { type: 'string' }, ...JSON_OPTION, units: { type: 'string' }, 'as-element': { type: 'boolean' } },
    positionals: [1, 1],
    async run([target], values) {
      return (await import('./remote')).run(target, {
        revision: values.revision as string | undefined, json: Boolean(values.json), units: values.units as string | undefined, asElement: Boolean(values['as-element']),
      })
    },
  },
  history: {
    usage: 'history LAB/SYSTEM [--json]',
    summary: "list a system's revisions, newest first, with author, message and newest run",
    details: 'Exit 0; 2 no such system; 4 not allowed.',
    options: JSON_OPTION,
    positionals: [1, 1],
    async run([target], values) {
      return (await import('./remote')).history(target, { json: Boolean(values.json) })
    },
  },
}

const EXIT_CODES = 'Exit codes: 0 ok, 1 failed, 2 bad input or diagnostics, 3 conflict, 4 not allowed.'

function overview(): string {
  const width = Math.max(...Object.values(COMMANDS).map((c) => c.usage.length))
  return [
    'usage: equipoise COMMAND [options]      (or: npm run -s cli -- COMMAND [options])',
    '',
    ...Object.values(COMMANDS).map((c) => `  ${c.usage.padEnd(width)}  ${c.summary}`),
    '',
    'equipoise COMMAND --help says more about each. The server commands use the login kept by',
    '`equipoise login`; EQUIPOISE_SERVER and EQUIPOISE_TOKEN override it.',
    EXIT_CODES,
  ].join('\n')
}

function helpOf(name: string, command: Command): string {
  return [`usage: equipoise ${command.usage}`, '', `${command.summary[0]!.toUpperCase()}${command.summary.slice(1)}.`, command.details].join('\n')
}

export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    const topic = name === 'help' ? rest[0] : undefined
    const command = topic ? COMMANDS[topic] : undefined
    if (command) console.log(helpOf(topic!, command))
    else (name ? console.log : console.error)(overview())
    return name ? EXIT.ok : EXIT.badInput
  }
  const command = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined
  if (!command) {
    console.error(`Unknown command "${name}".\n\n${overview()}`)
    return EXIT.badInput
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    console.log(helpOf(name, command))
    return EXIT.ok
  }
  let parsed: { values: Values, positionals: string[] }
  try {
    parsed = parseArgs({ args: rest, options: command.options, allowPositionals: true, strict: true }) as typeof parsed
  } catch (error) {
    console.error(`${(error as Error).message.replace(/\. To specify a positional.*$/s, '')}.\nusage: equipoise ${command.usage}  (equipoise ${name} --help says more)`)
    return EXIT.badInput
  }
  const [min, max] = command.positionals
  if (parsed.positionals.length < min || parsed.positionals.length > max) {
    console.error(`${name} takes ${min === max ? min : `${min} or more`} argument${max === 1 ? '' : 's'}, not ${parsed.positionals.length}.\nusage: equipoise ${command.usage}`)
    return EXIT.badInput
  }
  try {
    return await command.run(parsed.positionals, parsed.values, rest)
  } catch (error) {
    if (error instanceof CliError) {
      console.error(error.message)
      return error.code
    }
    console.error(`equipoise ${name} failed: ${(error as Error)?.message ?? String(error)}`)
    return EXIT.failed
  }
}

main(process.argv.slice(2)).then((code) => { process.exitCode = code }, (error) => {
  console.error((error as Error)?.message ?? String(error))
  process.exitCode = EXIT.failed
})
