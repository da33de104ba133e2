import type { Sequelize } from 'sequelize'
import type { Config } from './config.ts'
import type { Models } from './db/models.ts'
import type { Mailer } from './mail/mailer.ts'
import type { ComputePool } from './compute/pool.ts'

/** What every service function receives: passed in once, at start-up (see app.ts). */
export interface Services {
  config: Config
  sequelize: Sequelize
  models: Models
  mailer: Mailer
  /** Worker threads for heavy numerics (default: the process-wide pool of server/compute/pool.ts). */
  compute?: ComputePool
}
