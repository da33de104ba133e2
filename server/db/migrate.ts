import { Umzug, SequelizeStorage } from 'umzug'
import type { QueryInterface, Sequelize } from 'sequelize'
import * as m0001 from './migrations/0001-initial.ts'
import * as m0002 from './migrations/0002-analyses.ts'
import * as m0003 from './migrations/0003-sampling-runs.ts'
import * as m0004 from './migrations/0004-reports.ts'
import * as m0005 from './migrations/0005-dataset-time-units.ts'
import * as m0006 from './migrations/0006-star-astrometry.ts'
import * as m0007 from './migrations/0007-security.ts'
import * as m0009 from './migrations/0009-limits.ts'
import * as m0008 from './migrations/0008-sampling-chunks.ts'
import * as m0010 from './migrations/0010-api-tokens.ts'
import * as m0012 from './migrations/0012-periodogram-curves.ts'
import * as m0011 from './migrations/0011-triage.ts'

type Step = { up: (p: { context: QueryInterface }) => Promise<void>; down: (p: { context: QueryInterface }) => Promise<void> }
/** Every migration in order. Add a new file under migrations/ and list it here. */
const MIGRATIONS: [string, Step][] = [['0001-initial', m0001], ['0002-analyses', m0002], ['0003-sampling-runs', m0003], ['0004-reports', m0004], ['0005-dataset-time-units', m0005], ['0006-star-astrometry', m0006], ['0007-security', m0007], ['0008-sampling-chunks', m0008], ['0009-limits', m0009], ['0010-api-tokens', m0010], ['0011-triage', m0011], ['0012-periodogram-curves', m0012]]

export function createMigrator(sequelize: Sequelize): Umzug<QueryInterface> {
  return new Umzug({
    migrations: MIGRATIONS.map(([name, step]) => ({ name, up: step.up, down: step.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  })
}
