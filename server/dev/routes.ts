import type { Request, Response } from 'express'
import { readFileSync } from 'node:fs'
import type { Services } from '../services.ts'
import { listDevMail } from '../mail/dev-server.ts'
import { databaseError, NotFoundError, UnavailableError } from '../errors.ts'
import { loopDelay } from '../loop-delay.ts'

const version = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version

/**
 * Liveness: cheap, never touches the database (a load balancer may call it often). Answered before
 * the body parser and the session lookup (server/app.ts). `eventLoop`: the API's recent event-loop
 * delay when the process measures it (server/loop-delay.ts).
 */
export function health(_req: Request, res: Response): void {
  const eventLoop = loopDelay()
  res.json(eventLoop ? { ok: true, version, eventLoop } : { ok: true, version })
}

const READY_TIMEOUT_MS = 2000

/** Readiness: the database answers a trivial query within 2 s, else 503 with Retry-After. */
export async function ready(_req: Request, res: Response, s: Services): Promise<void> {
  let timer: NodeJS.Timeout | undefined
  const timeout = new Promise<never>((_r, reject) => { timer = setTimeout(() => reject(new UnavailableError('The database did not answer within 2 s: try again in a few seconds.')), READY_TIMEOUT_MS) })
  try {
    await Promise.race([s.sequelize.query('SELECT 1'), timeout])
  } catch (err) {
    throw databaseError(err) ?? (err instanceof UnavailableError ? err : new UnavailableError())
  } finally {
    clearTimeout(timer)
  }
  res.json({ ok: true, version, database: 'up' })
}

/** Development only: the messages the local SMTP server stored, newest first. */
export async function mailJson(_req: Request, res: Response, s: Services): Promise<void> {
  if (!s.config.devRoutes) throw new NotFoundError('Route')
  res.json(await listDevMail(s.config.mailDir))
}

const esc = (t: string) => t.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`)
const linkify = (t: string) => esc(t).replace(/https?:\/\/[^\s<]+/g, (u) => `<a href="${u}">${u}</a>`)

export async function mailPage(_req: Request, res: Response, s: Services): Promise<void> {
  if (!s.config.devRoutes) throw new NotFoundError('Route')
  const messages = await listDevMail(s.config.mailDir)
  const items = messages.map((m) => `<article><h2>${esc(m.subject)}</h2><p><b>To:</b> ${esc(m.to.join(', '))} · ${esc(m.date)}</p><pre>${linkify(m.text)}</pre></article>`)
  res.type('html').send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Starsway: local mail</title>
<style>body{font-family:sans-serif;max-width:50rem;margin:2rem auto}article{border-bottom:1px solid #ccc}pre{white-space:pre-wrap}</style></head>
<body><h1>Local mail (development only)</h1><p>${messages.length} message(s) in <code>${esc(s.config.mailDir)}</code>, newest first.</p>${items.join('\n') || '<p>No messages yet.</p>'}</body></html>`)
}
