// The API description: generated from the routes table and the shared zod schemas, valid OpenAPI 3.1
// by an independent validator from npm (@readme/openapi-parser), covering every route.
import { validate } from '@readme/openapi-parser'
import { describe, expect, it } from 'vitest'
import { routes } from '../../server/routes.ts'
import { BODIES, NO_JSON_BODY, openApiDocument } from '../../server/openapi/document.ts'

describe('OpenAPI document', () => {
  const doc = openApiDocument('0.0.0-test') as { paths: Record<string, Record<string, { requestBody?: { content: Record<string, { schema: Record<string, unknown> }> }; description: string }>> }

  it('is valid OpenAPI by an independent validator', async () => {
    const result = await validate(structuredClone(doc) as never)
    expect(result.valid, JSON.stringify(result)).toBe(true)
  })

  it('lists every route of the routes table with who may call it', () => {
    for (const r of routes) {
      const op = doc.paths[r.path.replace(/:([A-Za-z]+)/g, '{$1}')]?.[r.method]
      expect(op, `${r.method} ${r.path}`).toBeDefined()
      expect(op!.description).toMatch(/Who may call it: /)
    }
    expect(doc.paths['/api/stars/{starId}/models']!.post!.description).toMatch(/analyst role or higher/)
    expect(doc.paths['/api/teams']!.get!.description).toMatch(/any signed-in user/)
  })

  it('describes the JSON body of every writing route (or says it has none)', () => {
    const missing = routes.filter((r) => r.method !== 'get' && !BODIES[`${r.method} ${r.path}`] && !NO_JSON_BODY.has(`${r.method} ${r.path}`))
    expect(missing.map((r) => `${r.method} ${r.path}`)).toEqual([])
    const fit = doc.paths['/api/stars/{starId}/models']!.post!.requestBody!.content['application/json']!.schema
    expect(fit.type).toBe('object')
    expect(Object.keys(fit.properties as object)).toEqual(expect.arrayContaining(['name', 'spec']))
  })
})
