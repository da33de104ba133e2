import { readFileSync } from 'node:fs'
import type { Request, Response } from 'express'
import { openApiDocument, access } from './document.ts'
import { routes } from '../routes.ts'

let cached: { json: Record<string, unknown>; html: string } | undefined

function productVersion(): string {
  try { return (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version } catch { return '0.0.0' }
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`)

function build() {
  const json = openApiDocument(productVersion())
  const rows = routes.map((r) => `<tr><td><code>${r.method.toUpperCase()}</code></td><td><code>${esc(r.path)}</code></td><td>${esc(access(r))}</td></tr>`).join('\n')
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Starsway API</title></head><body>
<h1>Starsway API</h1>
<p>The machine-readable description (OpenAPI 3.1) is at <a href="/api/openapi.json">/api/openapi.json</a>: load it in any OpenAPI tool or client generator.
Units: days, m/s, degrees; times are full Julian dates in each dataset's recorded time scale. Errors are <code>{"error": {"code", "message", "field"}}</code>.</p>
<table border="1" cellpadding="4"><thead><tr><th>Method</th><th>Path</th><th>Who may call it</th></tr></thead><tbody>
${rows}
</tbody></table></body></html>`
  return { json, html }
}

/** GET /api/openapi.json */
export function openApiJson(_req: Request, res: Response): void {
  cached ??= build()
  res.json(cached.json)
}

/** GET /api/docs: the routes as a page a person reads. */
export function docsPage(_req: Request, res: Response): void {
  cached ??= build()
  res.type('text/html; charset=utf-8').send(cached.html)
}
