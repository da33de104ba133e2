import { DataTypes, type QueryInterface } from 'sequelize'

// Star astrometry for barycentric times (issue 10): proper motion (μα* = μα cos δ and μδ, mas/yr)
// at the epoch of the coordinates (a TDB Julian date; J2000.0 when not given), and the star's
// default observatory ({ id?, name, lonDeg, latDeg, heightM }) offered when its times are converted.
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('stars', 'pm_ra_mas_yr', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('stars', 'pm_dec_mas_yr', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('stars', 'coord_epoch_jd', { type: DataTypes.DOUBLE, allowNull: true })
  await qi.addColumn('stars', 'default_site', { type: DataTypes.JSONB, allowNull: true })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.removeColumn('stars', 'default_site')
  await qi.removeColumn('stars', 'coord_epoch_jd')
  await qi.removeColumn('stars', 'pm_dec_mas_yr')
  await qi.removeColumn('stars', 'pm_ra_mas_yr')
}
