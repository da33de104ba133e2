import { QueryTypes, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { ParseOutput } from './tasks.ts'

/** Rows per INSERT statement (each column travels as one array parameter). */
export const INSERT_CHUNK = 50_000

/**
 * Inserts the rows `rows` (indices into the parsed columns) of one dataset: one statement per
 * chunk, each column one array parameter that PostgreSQL unnests — far faster than one VALUES
 * tuple per row. Doubles keep their exact value (the driver writes the shortest round-trip
 * representation). Rows a flag column marks are stored excluded, the flag as the reason, by the
 * uploader. Returns how many were stored excluded.
 */
export async function insertMeasurements(
  s: Services, datasetId: number, starId: number, actorId: number, o: ParseOutput, rows: number[], transaction: Transaction,
): Promise<number> {
  let excluded = 0
  for (let start = 0; start < rows.length; start += INSERT_CHUNK) {
    const part = rows.slice(start, start + INSERT_CHUNK)
    const reasons = part.map((k) => o.excludedReason[k] ?? null)
    excluded += reasons.filter((r) => r !== null).length
    await s.sequelize.query(
      `INSERT INTO measurements (dataset_id, star_id, line, time, rv, error, indicators, excluded, excluded_reason, excluded_by, excluded_at)
       SELECT $1, $2, x.line, x.time, x.rv, x.error, COALESCE(x.indicators::jsonb, '{}'::jsonb), x.reason IS NOT NULL, x.reason,
              CASE WHEN x.reason IS NULL THEN NULL ELSE $3::integer END, CASE WHEN x.reason IS NULL THEN NULL ELSE now() END
         FROM unnest($4::integer[], $5::double precision[], $6::double precision[], $7::double precision[], $8::text[], $9::text[])
           AS x(line, time, rv, error, indicators, reason)`,
      {
        bind: [datasetId, starId, actorId, part.map((k) => o.line[k]!), part.map((k) => o.time[k]!), part.map((k) => o.rv[k]!),
          part.map((k) => o.error[k]!), part.map((k) => o.indicators[k] ?? null), reasons],
        transaction, type: QueryTypes.INSERT,
      },
    )
  }
  return excluded
}
