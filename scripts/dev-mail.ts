// The local SMTP server on its own: `tsx scripts/dev-mail.ts` (SMTP_PORT, MAIL_DIR from the environment).
import { loadConfig } from '../server/config.ts'
import { startDevMailServer } from '../server/mail/dev-server.ts'

const config = loadConfig()
const server = await startDevMailServer({ port: config.smtp.port, dir: config.mailDir })
console.log(`Local mail server on 127.0.0.1:${server.port}; messages are stored in ${server.dir}`)
const stop = () => void server.close().then(() => process.exit(0))
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
