import { pino } from 'pino'
import type { Server } from 'node:http'
import { loadConfig } from './config.ts'
import { createApp } from './app.ts'
import { errorForLog } from './errors.ts'
import { createSequelize, initModels, warmPool } from './db/index.ts'
import { createMailer } from './mail/mailer.ts'
import { startJobWorkers, type JobWorkers } from './jobs/index.ts'
import { startLoopDelay } from './loop-delay.ts'

const config = loadConfig()
// asynchronous log writes: a synchronous write per request to a slow pipe or disk held the event
// loop (CPU profile under load, issue 11); flushed before every exit below
const logDestination = pino.destination({ dest: 1, sync: false })
const logger = pino({ level: config.env === 'test' ? 'silent' : 'info' }, logDestination)
const exit = (code: number): never => { try { logDestination.flushSync() } catch { /* not ready yet */ } process.exit(code) }
startLoopDelay()
const sequelize = createSequelize(config.databaseUrl, { keepOpen: true })
try {
  await sequelize.authenticate()
  await warmPool(sequelize) // every pooled connection made before the first request (server/db/sequelize.ts)
} catch (err) {
  const where = (() => { try { const u = new URL(config.databaseUrl); return `${u.hostname}:${u.port || 5432}${u.pathname}` } catch { return 'DATABASE_URL' } })()
  logger.fatal(`Cannot reach the database at ${where}: ${(err as Error).message}. Start PostgreSQL (npm start does) or fix DATABASE_URL.`)
  exit(1)
}
// a crash is logged and ends the process with status 1: scripts/start.sh (or systemd, a container
// runtime) starts it again; never keep serving in an unknown state
process.on('uncaughtException', (err) => { logger.fatal({ err: errorForLog(err) }, 'uncaught exception: exiting'); exit(1) })
process.on('unhandledRejection', (err) => { logger.fatal({ err: errorForLog(err) }, 'unhandled promise rejection: exiting'); exit(1) })
const models = initModels(sequelize)
const mailer = createMailer(config.smtp)
const app = createApp({ config, sequelize, models, mailer, logger })

// job workers (posterior sampling) in this process unless JOB_WORKERS=0; more can run elsewhere (scripts/worker.ts)
const workers: JobWorkers | null = config.jobs.workers
  ? await startJobWorkers({ config, sequelize, models, mailer }, { log: (msg) => logger.info(msg) })
  : null

const server: Server = app.listen(config.port, config.host, () => {
  logger.info(`Starsway API listening on http://${config.host}:${config.port} (app URL ${config.appUrl})`)
})

let stopping = false
async function shutdown(signal: string): Promise<void> {
  if (stopping) return
  stopping = true
  logger.info(`${signal}: shutting down`)
  const force = setTimeout(() => exit(1), 10_000)
  force.unref()
  server.close()
  server.closeIdleConnections()
  await workers?.stop().catch((err: unknown) => logger.error({ err }, 'stopping the job workers failed'))
  mailer.close()
  await sequelize.close()
  exit(0)
}
process.on('SIGINT', () => void shutdown('SIGINT'))
process.on('SIGTERM', () => void shutdown('SIGTERM'))
