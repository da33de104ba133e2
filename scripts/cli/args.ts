// Command-line arguments: node:util parseArgs per command, our own option spellings, help texts.
import { parseArgs, type ParseArgsConfig } from 'node:util'

export class UsageError extends Error {}

type Options = NonNullable<ParseArgsConfig['options']>

const INPUT: Options = {
  'time-col': { type: 'string' }, 'rv-col': { type: 'string' }, 'err-col': { type: 'string' }, 'instrument-col': { type: 'string' },
  unit: { type: 'string' }, 'time-format': { type: 'string' }, instruments: { type: 'string' },
  json: { type: 'boolean' }, help: { type: 'boolean', short: 'h' },
}

export const COMMANDS: Record<string, { options: Options; help: string }> = {
  periodogram: {
    options: {
      ...INPUT, 'min-period': { type: 'string' }, 'max-period': { type: 'string' }, oversample: { type: 'string' },
      frequencies: { type: 'string' }, peaks: { type: 'string' }, 'gls-only': { type: 'boolean' },
    },
    help: `usage: cli.ts periodogram FILE|- [options]

Generalised Lomb–Scargle periodogram of one velocity table (each instrument's weighted mean removed
first), its highest peaks with false-alarm probabilities and aliases, the false-alarm levels, and
the Keplerian periodogram over the same range.

  --min-period D       shortest period, days (default 0.5 d; 0.2 d for dense nightly sampling)
  --max-period D       longest period, days (default 5 × the baseline)
  --oversample K       grid step 1/(K × baseline) (default 10)
  --frequencies M      exactly M grid frequencies instead of --oversample
  --peaks K            number of peaks listed (default 10)
  --gls-only           skip the Keplerian periodogram (eccentric orbits, an offset per instrument
                       fitted at every period: the search's statistic; computed by default)
${inputHelp()}`,
  },
  fit: {
    options: {
      ...INPUT, planets: { type: 'string' }, trend: { type: 'string' }, 'min-period': { type: 'string' }, 'max-period': { type: 'string' },
      'max-planets': { type: 'string' }, 'false-alarm': { type: 'string' },
      planet: { type: 'string', multiple: true }, prior: { type: 'string', multiple: true }, 'max-iterations': { type: 'string' },
      'star-mass': { type: 'string' }, 'star-mass-err': { type: 'string' },
      noise: { type: 'string' }, 'rotation-period': { type: 'string' }, 'gp-kernel': { type: 'string' }, 'decay-time': { type: 'string' },
    },
    help: `usage: cli.ts fit FILE|- [options]

Keplerian orbits of one velocity table: found from the data alone (the search), or fitted from
planets you give with --planet. Offsets and jitters are fitted per instrument.

search (no --planet):
  --planets N|auto     number of planets (default auto: stop by the search's rules)
  --trend T            auto (default), none, linear or quadratic
  --min-period D       shortest period searched, days (default of the search grid)
  --max-period D       longest period searched, days
  --max-planets N      most planets tried in auto mode
  --false-alarm P      keep a new signal only at false-alarm probability ≤ P (default 0.001; law calibrated on noise)
model (one --planet per planet, in order b, c, …):
  --planet SPEC        period=D[,K=M/S][,e=E][,omegaDeg=DEG][,tc=JD|tp=JD][,fix=P+Q…]
                       only period is required; fix names period, K, e, omegaDeg, tc or tp
  --prior SPEC         b.PARAM=normal:MU:SIGMA or b.PARAM=uniform:MIN:MAX (planet by letter or number)
  --trend T            none (default), linear or quadratic
  --max-iterations N   optimiser iteration limit (default 200)
both:
  --star-mass M        stellar mass, solar masses (M sin i and a are given with it)
  --star-mass-err E    its 1σ error, solar masses
noise (stellar activity as a Gaussian process):
  --noise auto|white|gp  auto (default): a search on a table with activity-indicator columns
                       (bisector, FWHM, S-index …) or with --rotation-period ties a GP to the
                       rotation period and searches planets on top of it, printing
                       "N planets + M activity candidates", the GP hyperparameters and the BIC of
                       planets + white noise and planets + GP; otherwise white noise.
                       white: the plain search or fit. gp: a GP (needs a rotation period from
                       --rotation-period, or, in a search, from an indicator's periodogram)
  --rotation-period D[,SIGMA]  rotation period, days, the centre of its Gaussian prior and its
                       1σ (default 10 % of D)
  --gp-kernel K        rotation (default; two damped oscillators at P and P/2, O(N)) or
                       quasi-periodic (exp-sine-squared × squared exponential, dense Cholesky)
  --decay-time D       start of the decay time of the active regions, days (> half the period;
                       default twice the rotation period)
${inputHelp()}`,
  },
}

function inputHelp(): string {
  return `input:
  FILE or -            the table (- reads standard input)
  --time-col C --rv-col C --err-col C --instrument-col C   column by header name or 1-based index
  --unit m/s|km/s      velocity unit of the file (default: detected)
  --time-format F      jd, bjd, mjd, days or jd-N (N added to the times)
  --instruments A,B    only these instruments
  --json               one JSON document on standard output, with units
  -h, --help           this text`
}

export const USAGE = `usage: cli.ts periodogram|fit FILE|- [options]
       cli.ts COMMAND --help      options of a command
       cli.ts --version`

export interface Parsed {
  command: string
  file: string
  values: Record<string, string | boolean | Array<string | boolean> | undefined>
}

/** Parses argv for one command; `{ help }` for --help. */
export function parseCommand(argv: string[]): Parsed | { help: string } {
  const [command, ...rest] = argv
  if (!command || !(command in COMMANDS)) throw new UsageError(`unknown command '${command ?? ''}': use 'periodogram' or 'fit'. ${USAGE.split('\n')[0]}`)
  const spec = COMMANDS[command]
  let parsed
  try {
    parsed = parseArgs({ args: rest, options: spec.options, allowPositionals: true, strict: true })
  } catch (e) {
    const err = e as Error & { code?: string }
    if (err.code === 'ERR_PARSE_ARGS_UNKNOWN_OPTION') {
      const name = /'([^']+)'/.exec(err.message)?.[1] ?? err.message
      throw new UsageError(`unknown option ${name} for '${command}' (see cli.ts ${command} --help)`)
    }
    if (err.code === 'ERR_PARSE_ARGS_INVALID_OPTION_VALUE') {
      const name = /--[a-z-]+/.exec(err.message)?.[0] ?? 'an option'
      throw new UsageError(`option ${name} needs a value (a value starting with '-' is written ${name}=VALUE)`)
    }
    throw new UsageError(err.message)
  }
  if (parsed.values.help) return { help: spec.help }
  const pos = parsed.positionals
  if (pos.length === 0) throw new UsageError(`missing FILE (or - for standard input). ${USAGE.split('\n')[0]}`)
  if (pos.length > 1) throw new UsageError(`unexpected argument '${pos[1]}': give exactly one FILE`)
  for (const [k, v] of Object.entries(parsed.values)) if (v === '') throw new UsageError(`option --${k} needs a value`)
  return { command, file: pos[0], values: parsed.values }
}

export function str(p: Parsed, name: string): string | undefined {
  const v = p.values[name]
  return typeof v === 'string' ? v : undefined
}

export function list(p: Parsed, name: string): string[] {
  const v = p.values[name]
  return Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string') : []
}

export function num(p: Parsed, name: string, check: (v: number) => boolean, what: string): number | undefined {
  const s = str(p, name)
  if (s === undefined) return undefined
  const v = Number(s)
  if (s.trim() === '' || !Number.isFinite(v) || !check(v)) throw new UsageError(`--${name} must be ${what}, got '${s}'`)
  return v
}
