export { createMailer, type Mailer, type OutgoingMail } from './mailer.ts'
export { startDevMailServer, listDevMail, type DevMailServer } from './dev-server.ts'
