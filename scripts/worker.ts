// A job worker process without the HTTP API: works on the job queue (posterior sampling runs) of
// the database at DATABASE_URL, on this machine or any other that reaches it. Several may run at
// once; each takes JOB_CONCURRENCY runs at a time. SIGINT/SIGTERM: running samplers save a
// checkpoint and stop, and their jobs go back to the queue (another worker resumes them).
//   DATABASE_URL=postgres://… SMTP_HOST=… APP_URL=https://… npx tsx scripts/worker.ts
import { pino } from 'pino'
import { loadConfig } from '../server/config.ts'
import { createSequelize, initModels } from '../server/db/index.ts'
import { createMailer } from '../server/mail/mailer.ts'
import { startJobWorkers } from '../server/jobs/index.ts'

const config = loadConfig()
const logger = pino({ level: process.env.LOG_LEVEL ?? 'info' })
const sequelize = createSequelize(config.databaseUrl, { pool: 4 })
await sequelize.authenticate()
const models = initModels(sequelize)
const mailer = createMailer(config.smtp)
const workers = await startJobWorkers({ config, sequelize, models, mailer }, { log: (msg) => logger.info(msg) })
logger.info(`worker ${workers.workerId} ready (database ${new URL(config.databaseUrl).host})`)

let stopping = false
async function shutdown(signal: string): Promise<void> {
  if (stopping) return
  stopping = true
  logger.info(`${signal}: stopping`)
  const force = setTimeout(() => process.exit(1), 30_000)
  force.unref()
  await workers.stop()
  mailer.close()
  await sequelize.close()
  process.exit(0)
}
process.on('SIGINT', () => void shutdown('SIGINT'))
process.on('SIGTERM', () => void shutdown('SIGTERM'))
