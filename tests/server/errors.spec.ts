import express from 'express'
import request from 'supertest'
import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import { errorMiddleware, NotFoundError, ValidationError } from '../../server/errors.ts'

function appThrowing(err: unknown) {
  const logged: string[] = []
  const app = express()
  app.get('/boom', () => { throw err })
  app.use(errorMiddleware({ maxUploadBytes: 1024, log: (_e, id) => logged.push(id) }))
  return { app, logged }
}

describe('the error middleware', () => {
  it('hides an unexpected error behind a generic 500 with a request id', async () => {
    const { app, logged } = appThrowing(new Error('password column leaked'))
    const res = await request(app).get('/boom').expect(500)
    expect(res.body.error.code).toBe('internal')
    expect(JSON.stringify(res.body)).not.toMatch(/password column/)
    expect(res.body.error.requestId).toBe(logged[0])
    expect(res.body.error.message).toContain(logged[0])
  })

  it('renders typed errors and zod errors with the field', async () => {
    const nf = await request(appThrowing(new NotFoundError('Star')).app).get('/boom').expect(404)
    expect(nf.body).toEqual({ error: { code: 'not_found', message: 'Star not found.' } })
    const v = await request(appThrowing(new ValidationError('must be positive', 'massMsun')).app).get('/boom').expect(400)
    expect(v.body.error).toEqual({ code: 'validation', message: 'must be positive', field: 'massMsun' })
    const zerr = z.object({ massMsun: z.number() }).safeParse({ massMsun: 'x' }).error
    const zres = await request(appThrowing(zerr).app).get('/boom').expect(400)
    expect(zres.body.error.field).toBe('massMsun')
    expect(zres.body.error.message).toMatch(/^massMsun: /)
  })
})
