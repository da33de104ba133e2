import nodemailer from 'nodemailer'
import type { Config } from '../config.ts'

export interface OutgoingMail { to: string; subject: string; text: string; html?: string }
export interface Mailer { send(mail: OutgoingMail): Promise<void>; close(): void }

/** nodemailer over SMTP: the local dev server in development and tests, the hosted service in production. */
export function createMailer(smtp: Config['smtp']): Mailer {
  const local = smtp.host === '127.0.0.1' || smtp.host === 'localhost'
  const transport = nodemailer.createTransport({
    host: smtp.host, port: smtp.port, secure: smtp.port === 465,
    ignoreTLS: local,
    auth: smtp.user ? { user: smtp.user, pass: smtp.pass ?? '' } : undefined,
  })
  return {
    async send(mail) {
      await transport.sendMail({ from: smtp.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html })
    },
    close() { transport.close() },
  }
}
