import { Sequelize } from 'sequelize'

/** One Sequelize instance per database URL; SQL logging stays off (pino logs requests). */
export function createSequelize(url: string, opts: { pool?: number } = {}): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    pool: { max: opts.pool ?? 10, min: 0, idle: 10000 },
    define: { underscored: true },
  })
}
