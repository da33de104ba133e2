import { DataTypes, type QueryInterface } from 'sequelize'

// Datasets remember how their file was read (issue 10): the time scale ('bjd_tdb', 'jd_utc', …,
// 'unknown'), the zero point the times were written with (JD − N: N days, 0 for full JD), the
// per-column units ({ rv, error, indicators: { key: unit } }), the time conversion done at upload
// ({ from, site, target } or null), the rows skipped at commit ([{ line, column?, message }]), the
// overlap with earlier data and the user's choice, and the warnings shown. Older rows: 'bjd' means
// BJD_TDB; the other formats get their offset.
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('datasets', 'time_scale', { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'unknown' })
  await qi.addColumn('datasets', 'time_offset', { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 })
  await qi.addColumn('datasets', 'units', { type: DataTypes.JSONB, allowNull: false, defaultValue: {} })
  await qi.addColumn('datasets', 'time_conversion', { type: DataTypes.JSONB, allowNull: true })
  await qi.addColumn('datasets', 'skipped_rows', { type: DataTypes.JSONB, allowNull: false, defaultValue: [] })
  await qi.addColumn('datasets', 'overlap', { type: DataTypes.JSONB, allowNull: true })
  await qi.addColumn('datasets', 'warnings', { type: DataTypes.JSONB, allowNull: false, defaultValue: [] })
  await qi.sequelize.query(`UPDATE datasets SET time_scale = 'bjd_tdb' WHERE time_format = 'bjd'`)
  await qi.sequelize.query(`UPDATE datasets SET time_offset = CASE time_format WHEN 'mjd' THEN 2400000.5
    WHEN 'jd-2400000' THEN 2400000 WHEN 'jd-2450000' THEN 2450000 ELSE 0 END`)
  await qi.sequelize.query(`UPDATE datasets SET units = jsonb_build_object('rv', unit, 'error', unit)`)
  // The duplicate-file check looks datasets up by star and content hash.
  await qi.addIndex('datasets', ['star_id', 'file_sha256'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.removeIndex('datasets', ['star_id', 'file_sha256'])
  for (const c of ['warnings', 'overlap', 'skipped_rows', 'time_conversion', 'units', 'time_offset', 'time_scale']) await qi.removeColumn('datasets', c)
}
