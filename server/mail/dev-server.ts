import { SMTPServer } from 'smtp-server'
import { mkdir, readdir, readFile, writeFile } from 'node:fs/promises'
import { join } from 'node:path'
import type { AddressInfo } from 'node:net'
import type { DevMailMessage } from '../../shared/api/misc.ts'

export interface DevMailServer { port: number; dir: string; close(): Promise<void> }

/** Decodes the parts of a simple MIME message (what nodemailer sends): text and html bodies. */
export function parseMessage(raw: string): { headers: Record<string, string>; text: string; html?: string } {
  const [head, ...rest] = raw.split(/\r?\n\r?\n/)
  const body = rest.join('\n\n')
  const headers = parseHeaders(head ?? '')
  const type = headers['content-type'] ?? 'text/plain'
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1]
  if (!boundary) {
    const text = decodeBody(body, headers['content-transfer-encoding']).replace(/\r\n/g, '\n')
    return type.includes('html') ? { headers, text: '', html: text } : { headers, text }
  }
  let text = ''
  let html: string | undefined
  for (const part of body.split(`--${boundary}`)) {
    const [ph, ...pb] = part.replace(/^\r?\n/, '').split(/\r?\n\r?\n/)
    const h = parseHeaders(ph ?? '')
    const content = decodeBody(pb.join('\n\n').replace(/\r?\n$/, ''), h['content-transfer-encoding']).replace(/\r\n/g, '\n')
    if ((h['content-type'] ?? '').startsWith('text/plain')) text = content
    else if ((h['content-type'] ?? '').startsWith('text/html')) html = content
  }
  return { headers, text, html }
}

function parseHeaders(head: string): Record<string, string> {
  const out: Record<string, string> = {}
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const i = line.indexOf(':')
    if (i > 0) out[line.slice(0, i).trim().toLowerCase()] = line.slice(i + 1).trim()
  }
  return out
}

function decodeBody(body: string, encoding = ''): string {
  const enc = encoding.toLowerCase()
  if (enc === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8')
  if (enc === 'quoted-printable') {
    const bytes = body.replace(/=\r?\n/g, '').replace(/=([0-9A-F]{2})/gi, (_m, h: string) => String.fromCharCode(parseInt(h, 16)))
    return Buffer.from(bytes, 'latin1').toString('utf8')
  }
  return body
}

function decodeWords(s: string): string {
  return s.replace(/=\?utf-8\?([bq])\?([^?]*)\?=/gi, (_m, e: string, t: string) =>
    e.toLowerCase() === 'b' ? Buffer.from(t, 'base64').toString('utf8') : decodeBody(t.replace(/_/g, ' '), 'quoted-printable'))
}

/**
 * A real SMTP server on 127.0.0.1 standing in for the hosted mail service. Each message it
 * receives is stored in `dir` as `<id>.eml` (as received) and `<id>.json` (to, subject, text…).
 */
export async function startDevMailServer(opts: { port: number; dir: string; host?: string }): Promise<DevMailServer> {
  await mkdir(opts.dir, { recursive: true })
  let seq = 0
  const server = new SMTPServer({
    authOptional: true, disabledCommands: ['STARTTLS'], logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8')
        const parsed = parseMessage(raw)
        const now = new Date()
        const id = `${now.toISOString().replace(/[:.]/g, '-')}-${process.pid}-${++seq}`
        const message: DevMailMessage = {
          id,
          to: session.envelope.rcptTo.map((r) => r.address),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          subject: decodeWords(parsed.headers['subject'] ?? ''),
          date: now.toISOString(),
          text: parsed.text,
          ...(parsed.html ? { html: parsed.html } : {}),
        }
        Promise.all([
          writeFile(join(opts.dir, `${id}.eml`), raw),
          writeFile(join(opts.dir, `${id}.json`), JSON.stringify(message, null, 2)),
        ]).then(() => callback(), (err: Error) => callback(err))
      })
    },
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve())
  })
  const port = (server.server.address() as AddressInfo).port
  return { port, dir: opts.dir, close: () => new Promise<void>((r) => server.close(() => r())) }
}

/** The stored messages in `dir`, newest first. */
export async function listDevMail(dir: string): Promise<DevMailMessage[]> {
  let names: string[]
  try { names = await readdir(dir) } catch { return [] }
  const out: DevMailMessage[] = []
  for (const n of names.filter((x) => x.endsWith('.json'))) {
    try { out.push(JSON.parse(await readFile(join(dir, n), 'utf8')) as DevMailMessage) } catch { /* partly written */ }
  }
  return out.sort((a, b) => (a.date < b.date ? 1 : a.date > b.date ? -1 : b.id.localeCompare(a.id)))
}
