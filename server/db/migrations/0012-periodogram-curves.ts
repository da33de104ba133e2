import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize'
import { decodeCurves, encodeCurves, periodCurve, type PeriodCurve } from '../../analyses/periodogram-codec.ts'

// Periodogram curves leave periodogram_runs.result (JSON numbers, ~290 kB a run) for a binary side
// table (server/analyses/periodogram-store.ts): `display` holds the plot copies, `full` every computed
// power (dropped past the team's bound: full_dropped_at). Existing runs keep their plot copies as
// `display`; they never had a full curve. Down puts the plot copies back into the JSON.

interface Curves { curve: PeriodCurve; window: PeriodCurve; keplerian?: { curve: PeriodCurve } | null }
const EMPTY = { period: [], power: [] }
const BATCH = 200

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('periodogram_curves', {
    run_id: { type: DataTypes.INTEGER, primaryKey: true, references: { model: 'periodogram_runs', key: 'id' }, onDelete: 'CASCADE' },
    display: { type: DataTypes.BLOB, allowNull: false },
    full: { type: DataTypes.BLOB, allowNull: true },
    full_bytes: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    full_dropped_at: { type: DataTypes.DATE, allowNull: true },
  })
  for (let after = 0; ;) {
    const rows = await qi.sequelize.query<{ id: number; result: Curves }>(
      'SELECT id, result FROM periodogram_runs WHERE id > :after ORDER BY id LIMIT :n',
      { replacements: { after, n: BATCH }, type: QueryTypes.SELECT },
    )
    if (!rows.length) break
    for (const r of rows) {
      const kp = r.result.keplerian
      const display = encodeCurves([
        periodCurve('curve', r.result.curve), periodCurve('window', r.result.window), ...(kp ? [periodCurve('keplerian', kp.curve)] : []),
      ])
      const stripped = { ...r.result, curve: EMPTY, window: EMPTY, ...(kp ? { keplerian: { ...kp, curve: EMPTY } } : {}) }
      await qi.sequelize.query('INSERT INTO periodogram_curves (run_id, display) VALUES (:id, :display)', { replacements: { id: r.id, display } })
      await qi.sequelize.query('UPDATE periodogram_runs SET result = CAST(:json AS jsonb) WHERE id = :id', { replacements: { id: r.id, json: JSON.stringify(stripped) } })
    }
    after = rows[rows.length - 1]!.id
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (let after = 0; ;) {
    const rows = await qi.sequelize.query<{ id: number; result: Curves; display: Buffer }>(
      `SELECT r.id, r.result, c.display FROM periodogram_runs r JOIN periodogram_curves c ON c.run_id = r.id
        WHERE r.id > :after ORDER BY r.id LIMIT :n`,
      { replacements: { after, n: BATCH }, type: QueryTypes.SELECT },
    )
    if (!rows.length) break
    for (const r of rows) {
      const c = decodeCurves(r.display)
      const kp = r.result.keplerian
      const result = {
        ...r.result, curve: c.get('curve') ?? EMPTY, window: c.get('window') ?? EMPTY,
        ...(kp ? { keplerian: { ...kp, curve: c.get('keplerian') ?? EMPTY } } : {}),
      }
      await qi.sequelize.query('UPDATE periodogram_runs SET result = CAST(:json AS jsonb) WHERE id = :id', { replacements: { id: r.id, json: JSON.stringify(result) } })
    }
    after = rows[rows.length - 1]!.id
  }
  await qi.dropTable('periodogram_curves')
}
