// Where a periodogram run's curves live (table periodogram_curves, migration 0012): the plot copies
// (GLS, window, Keplerian; ≤ 4000 points each, max-preserving bins so every peak's top survives) in
// `display`, every computed power in `full` (Float32; the GLS periods regenerated from its grid).
// periodogram_runs.result keeps the rest (grid, peaks, FAP levels, window peaks) with empty curves.
//
// Per-team bound (config `periodogramTeamBytes`, env PERIODOGRAM_TEAM_BYTES, default 128 MiB): after
// a run is saved, while the team's full curves weigh more than the bound, the full curve of the
// oldest run is dropped — runs that are no longer the newest of their series (star, kind,
// indicator, model version) first, then the oldest newest ones; never the run just made. Display
// curves, peaks and settings stay; frozen report versions hold their own copy of the curve.
import { QueryTypes, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { PeriodogramResult } from '../../shared/api/analyses.ts'
import type { FullCurves } from '../../shared/rv/periodogram-report.ts'
import { decodeCurves, encodeCurves, frequencyCurve, gridCurve, periodCurve, type PeriodCurve } from './periodogram-codec.ts'

const EMPTY = (): PeriodCurve => ({ period: [], power: [] })

/** The run's JSON without its curves, and the curves in binary form. */
export function splitForStorage(result: PeriodogramResult, full?: FullCurves): { json: PeriodogramResult; display: Buffer; full: Buffer | null } {
  const display = encodeCurves([
    periodCurve('curve', result.curve), periodCurve('window', result.window),
    ...(result.keplerian ? [periodCurve('keplerian', result.keplerian.curve)] : []),
  ])
  const json: PeriodogramResult = {
    ...result, curve: EMPTY(), window: EMPTY(),
    ...(result.keplerian ? { keplerian: { ...result.keplerian, curve: EMPTY() } } : {}),
  }
  const fullBuf = full ? encodeCurves([
    gridCurve('curve', full.grid.f0, full.grid.df, full.grid.power),
    ...(full.keplerian ? [frequencyCurve('keplerian', full.keplerian.frequency, full.keplerian.power)] : []),
  ]) : null
  return { json, display, full: fullBuf }
}

export async function saveCurves(s: Services, transaction: Transaction, runId: number, display: Buffer, full: Buffer | null): Promise<void> {
  await s.sequelize.query(
    'INSERT INTO periodogram_curves (run_id, display, "full", full_bytes) VALUES ($runId, $display, $full, $bytes)',
    { bind: { runId, display, full, bytes: full?.byteLength ?? 0 }, transaction },
  )
}

export interface RunCurves {
  display: Map<string, PeriodCurve>
  /** Null when asked without, or when not stored (`fullState`). */
  full: Map<string, PeriodCurve> | null
  fullState: 'stored' | 'dropped' | 'none'
  fullBytes: number
  fullDroppedAt: Date | null
}

/** The curves of one run (the full ones only when `full`). Null for a run saved without curves. */
export async function readCurves(s: Services, runId: number, opts: { full?: boolean } = {}): Promise<RunCurves | null> {
  const rows = await s.sequelize.query<{ display: Buffer; full: Buffer | null; full_bytes: number; full_dropped_at: Date | null; has_full: boolean }>(
    `SELECT display, ${opts.full ? '"full"' : 'NULL AS "full"'}, full_bytes, full_dropped_at, "full" IS NOT NULL AS has_full
       FROM periodogram_curves WHERE run_id = :runId`,
    { replacements: { runId }, type: QueryTypes.SELECT },
  )
  const r = rows[0]
  if (!r) return null
  return {
    display: decodeCurves(r.display),
    full: r.full ? decodeCurves(r.full) : null,
    fullState: r.has_full ? 'stored' : r.full_dropped_at ? 'dropped' : 'none',
    fullBytes: r.full_bytes,
    fullDroppedAt: r.full_dropped_at,
  }
}

/** The run's result with its curves put back: the display copies, or the full curves where stored (window: display). */
export function withCurves(json: PeriodogramResult, c: RunCurves, full = false): PeriodogramResult {
  const pick = (name: string): PeriodCurve => (full && c.full?.get(name)) || c.display.get(name) || EMPTY()
  return {
    ...json,
    curve: pick('curve'), window: c.display.get('window') ?? EMPTY(),
    ...(json.keplerian ? { keplerian: { ...json.keplerian, curve: pick('keplerian') } } : {}),
  }
}

/** Bytes of full curves the team keeps now. */
export async function teamFullBytes(s: Services, teamId: number, transaction?: Transaction): Promise<number> {
  const [row] = await s.sequelize.query<{ bytes: string | null }>(
    `SELECT sum(c.full_bytes) AS bytes FROM periodogram_curves c
       JOIN periodogram_runs r ON r.id = c.run_id JOIN stars st ON st.id = r.star_id
      WHERE st.team_id = :teamId AND c."full" IS NOT NULL`,
    { replacements: { teamId }, type: QueryTypes.SELECT, transaction },
  )
  return Number(row?.bytes ?? 0)
}

/**
 * Keeps the team's full curves within `bound` bytes (see the module comment for the order); the
 * run `keep` is never touched. Serialised per team by an advisory lock. Returns the runs dropped.
 */
export async function enforceTeamBound(s: Services, teamId: number, bound: number, keep?: number): Promise<{ dropped: number[]; bytes: number }> {
  return s.sequelize.transaction(async (transaction) => {
    await s.sequelize.query('SELECT pg_advisory_xact_lock(1212, :teamId)', { replacements: { teamId }, transaction })
    const rows = await s.sequelize.query<{ run_id: number; full_bytes: number; has_full: boolean; latest: boolean }>(
      `SELECT c.run_id, c.full_bytes, c."full" IS NOT NULL AS has_full,
              row_number() OVER (PARTITION BY r.star_id, r.kind, coalesce(r.indicator, ''), coalesce(r.model_version_id, 0)
                                 ORDER BY r.created_at DESC, r.id DESC) = 1 AS latest
         FROM periodogram_curves c JOIN periodogram_runs r ON r.id = c.run_id JOIN stars st ON st.id = r.star_id
        WHERE st.team_id = :teamId
        ORDER BY latest, r.created_at, r.id`,
      { replacements: { teamId }, type: QueryTypes.SELECT, transaction },
    )
    const stored = rows.filter((r) => r.has_full)
    let bytes = stored.reduce((a, r) => a + r.full_bytes, 0)
    const dropped: number[] = []
    for (const r of stored) {
      if (bytes <= bound) break
      if (r.run_id === keep) continue
      dropped.push(r.run_id)
      bytes -= r.full_bytes
    }
    if (dropped.length) {
      await s.sequelize.query(
        'UPDATE periodogram_curves SET "full" = NULL, full_bytes = 0, full_dropped_at = now() WHERE run_id IN (:dropped)',
        { replacements: { dropped }, transaction },
      )
    }
    return { dropped, bytes }
  })
}

/** The sentence the run's `downsampling` gains about its full curve. */
export function fullCurveNote(runId: number, c: RunCurves, served: boolean, bound: number): string {
  const mb = (b: number) => `${(b / 1048576).toFixed(1)} MB`
  if (served) return 'full curve: every computed power (window: plot copy)'
  if (c.fullState === 'stored') return `full curve stored (${mb(c.fullBytes)}): GET /api/periodograms/${runId}?full=1`
  if (c.fullState === 'dropped') {
    return `full curve dropped on ${c.fullDroppedAt!.toISOString().slice(0, 10)} to keep the team's stored curves under ${mb(bound)}; run the periodogram again to recompute it`
  }
  return 'full curve not stored (run made before full curves were kept); run the periodogram again to store it'
}

/** Puts a loaded run's plot curves back into its `result` (for readers of the model, e.g. report snapshots). */
export async function restoreDisplayCurves(s: Services, run: { id: number; result: PeriodogramResult }): Promise<void> {
  const c = await readCurves(s, run.id)
  if (c) run.result = withCurves(run.result, c)
}
