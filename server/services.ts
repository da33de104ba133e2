import type { Sequelize } from 'sequelize'
import type { Config } from './config.ts'
import type { Models } from './db/models.ts'
import type { Mailer } from './mail/mailer.ts'

/** What every service function receives: passed in once, at start-up (see app.ts). */
export interface Services {
  config: Config
  sequelize: Sequelize
  models: Models
  mailer: Mailer
}
