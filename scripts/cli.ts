/**
 * Starsway command line: periodogram and orbit fit of one velocity table.
 *
 *   npx tsx scripts/cli.ts periodogram FILE|- [options]     (cli.ts periodogram --help)
 *   npx tsx scripts/cli.ts fit FILE|- [options]             (cli.ts fit --help)
 *   npx tsx scripts/cli.ts --version
 *
 * Arguments are read by node:util parseArgs (scripts/cli/args.ts); tables by the same code as the
 * upload (shared/ingest); the science is the core's (periodogramReport, searchPlanets, fitSpec),
 * with the same defaults as the server. Rows with a problem are left out with a one-line warning
 * on stderr; bad input (unknown option, unreadable file, no usable rows) exits with code 2 and one
 * line on stderr. `--json` prints one document with a `units` map (astropy-parsable strings).
 */
import { readFileSync } from 'node:fs'
import { pathToFileURL } from 'node:url'
import { parseCommand, UsageError, USAGE } from './cli/args.ts'
import { runPeriodogram } from './cli/periodogram.ts'
import { runFit } from './cli/fit.ts'
import type { CliIo } from './cli/format.ts'

export type { CliIo }

function version(): string {
  const pkg = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }
  return `starsway ${pkg.version}`
}

/** Runs the command line; returns the exit code (0 ok, 2 bad input). */
export function main(argv: string[], io: CliIo = { out: (s) => process.stdout.write(s + '\n'), err: (s) => process.stderr.write(s + '\n') }): number {
  try {
    if (argv[0] === '--version' || argv[0] === '-V') { io.out(version()); return 0 }
    if (argv.length === 0 || argv[0] === '--help' || argv[0] === '-h' || argv[0] === 'help') { io.out(USAGE); return 0 }
    const p = parseCommand(argv)
    if ('help' in p) { io.out(p.help); return 0 }
    if (p.command === 'periodogram') runPeriodogram(p, io)
    else runFit(p, io)
    return 0
  } catch (e) {
    if (e instanceof UsageError) { io.err(`error: ${e.message}`); return 2 }
    throw e
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  process.exitCode = main(process.argv.slice(2))
}
