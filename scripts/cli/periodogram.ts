// `cli.ts periodogram`: the core's periodogramReport, the same function and defaults as the server.
import { periodogramReport } from '../../shared/rv/index.ts'
import { UsageError, num, type Parsed } from './args.ts'
import { load } from './load.ts'
import { fmt, table, UNITS, PEAK_CAUTION, type CliIo } from './format.ts'

export function runPeriodogram(p: Parsed, io: CliIo): void {
  const minPeriod = num(p, 'min-period', (v) => v > 0, 'a positive number of days')
  const maxPeriod = num(p, 'max-period', (v) => v > 0, 'a positive number of days')
  const oversample = num(p, 'oversample', (v) => v > 0, 'a positive number')
  const frequencies = num(p, 'frequencies', (v) => Number.isInteger(v) && v >= 2, 'an integer ≥ 2')
  const npeaks = num(p, 'peaks', (v) => Number.isInteger(v) && v >= 1, 'a positive integer')
  if (oversample !== undefined && frequencies !== undefined) throw new UsageError('give --oversample or --frequencies, not both')
  if (minPeriod !== undefined && maxPeriod !== undefined && !(maxPeriod > minPeriod)) throw new UsageError('--max-period must exceed --min-period')
  const { data, input } = load(p, io)
  const t0 = performance.now()
  let rep
  try {
    rep = periodogramReport({
      t: data.t, y: data.y, dy: data.dy, instrument: data.instrument, minPeriod, maxPeriod, oversample, frequencies, peaks: npeaks,
      keplerian: !p.values['gls-only'],
    })
  } catch (e) {
    if (e instanceof RangeError) throw new UsageError(`${e.message}; adjust --min-period/--max-period/--oversample/--frequencies`)
    throw e
  }
  const ms = performance.now() - t0
  const doc = {
    input,
    grid: { minFrequency: rep.grid.minFrequency, maxFrequency: rep.grid.maxFrequency, count: rep.grid.count, method: rep.grid.method, ...rep.settings },
    peaks: rep.peaks,
    fapLevels: rep.fapLevels,
    keplerian: rep.keplerian ? { count: rep.keplerian.count, oversample: rep.keplerian.oversample, cells: rep.keplerian.cells, peaks: rep.keplerian.peaks } : null,
    units: UNITS,
    timingMs: { periodogram: ms },
  }
  if (p.values.json) { io.out(JSON.stringify(doc)); return }
  io.out(`${input.file}: ${input.rows} rows, instruments ${input.instruments.join(', ')}, unit ${input.unit}, time ${input.timeFormat}, baseline ${fmt(input.baselineDays)} d`)
  io.out(`grid: ${doc.grid.count} frequencies, periods ${fmt(rep.settings.minPeriod)}–${fmt(rep.settings.maxPeriod)} d (${rep.grid.method}); each instrument's weighted mean removed`)
  io.out('')
  io.out(table(doc.peaks.map((k, i) => [
    i + 1, k.period, k.frequency, k.power, k.fap, k.aliases.map((a) => `${fmt(a.period)} (${a.source})`).join('; ') || '—',
  ]), ['#', 'period [d]', 'freq [1/d]', 'power', 'FAP', 'alias partners [d]']))
  io.out('')
  if (rep.keplerian) {
    io.out('')
    io.out(`Keplerian periodogram (e and an offset per instrument fitted at each of ${rep.keplerian.count} periods):`)
    io.out(table(rep.keplerian.peaks.slice(0, 5).map((k, i) => [i + 1, k.period, k.power, k.dchi2, k.e]), ['#', 'period [d]', 'power', 'Δχ²', 'best e']))
  }
  io.out('')
  io.out(`false-alarm levels (sinusoid): ${rep.fapLevels.map((l) => `${l.fap * 100} % at power ${fmt(l.power)}`).join(', ')}`)
  io.out(PEAK_CAUTION)
}
