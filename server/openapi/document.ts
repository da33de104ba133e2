/**
 * The machine-readable description of the API (OpenAPI 3.1), generated from the one routes table
 * (every route, its path parameters and the team role it needs) and the shared zod schemas (request
 * bodies and queries, via zod's JSON Schema export). Served at /api/openapi.json, and as a page a
 * person reads at /api/docs. Request bodies are described where the handler validates one; a test
 * fails when a writing route has neither a schema here nor a place in NO_JSON_BODY.
 */
import { z } from 'zod'
import { routes, type Route } from '../routes.ts'
import { signedIn } from '../guards.ts'
import { errorBodySchema } from '../../shared/api/errors.ts'
import {
  createModelRequestSchema, duplicateModelRequestSchema, fitModelRequestSchema, overruleRequestSchema, gpVariantRequestSchema, runPeriodogramRequestSchema, searchRequestSchema, updateModelRequestSchema,
} from '../../shared/api/analyses.ts'
import { changePasswordRequestSchema, loginRequestSchema, registerRequestSchema, resetPasswordRequestSchema, resetRequestSchema } from '../../shared/api/auth.ts'
import { deleteDatasetRequestSchema, updateMeasurementRequestSchema } from '../../shared/api/measurements.ts'
import { freezeRequestSchema, reviewRequestSchema, shareRequestSchema } from '../../shared/api/reports.ts'
import { samplingEstimateQuerySchema, startSamplingRequestSchema } from '../../shared/api/sampling.ts'
import { periodogramQuerySchema } from '../../shared/api/analyses.ts'
import { createStarRequestSchema, updateStarRequestSchema } from '../../shared/api/stars.ts'
import { createInvitationRequestSchema, createTeamRequestSchema, updateMemberRequestSchema } from '../../shared/api/teams.ts'
import { startLimitsRequestSchema } from '../../shared/api/limits.ts'
import { planRequestSchema } from '../../shared/api/plan.ts'
import { createTokenRequestSchema } from '../../shared/api/tokens.ts'
import { startTriageRequestSchema } from '../../shared/api/survey.ts'

type Schema = z.ZodType

/** Request bodies (JSON) by "METHOD path". */
export const BODIES: Record<string, Schema> = {
  'post /api/auth/register': registerRequestSchema,
  'post /api/auth/login': loginRequestSchema,
  'post /api/auth/password': changePasswordRequestSchema,
  'post /api/auth/reset-request': resetRequestSchema,
  'post /api/auth/reset': resetPasswordRequestSchema,
  'post /api/teams': createTeamRequestSchema,
  'patch /api/teams/:teamId/members/:userId': updateMemberRequestSchema,
  'post /api/teams/:teamId/invitations': createInvitationRequestSchema,
  'post /api/teams/:teamId/stars': createStarRequestSchema,
  'patch /api/stars/:starId': updateStarRequestSchema,
  'patch /api/measurements/:measurementId': updateMeasurementRequestSchema,
  'delete /api/datasets/:datasetId': deleteDatasetRequestSchema,
  'post /api/stars/:starId/periodograms': runPeriodogramRequestSchema,
  'post /api/stars/:starId/models': createModelRequestSchema,
  'patch /api/models/:modelId': updateModelRequestSchema,
  'post /api/models/:modelId/fit': fitModelRequestSchema,
  'post /api/models/:modelId/duplicate': duplicateModelRequestSchema,
  'post /api/models/:modelId/overrule': overruleRequestSchema,
  'post /api/models/:modelId/gp-variant': gpVariantRequestSchema,
  'post /api/stars/:starId/search': searchRequestSchema,
  'post /api/models/:modelId/sampling': startSamplingRequestSchema,
  'post /api/models/:modelId/report': freezeRequestSchema,
  'post /api/reports/:reportId/shares': shareRequestSchema,
  'post /api/reports/:reportId/reviews': reviewRequestSchema,
  'post /api/models/:modelId/limits': startLimitsRequestSchema,
  'post /api/stars/:starId/plan': planRequestSchema,
  'post /api/teams/:teamId/tokens': createTokenRequestSchema,
  'post /api/teams/:teamId/survey/runs': startTriageRequestSchema,
}

/** Query strings by "METHOD path". */
export const QUERIES: Record<string, z.ZodObject> = {
  'get /api/models/:modelId/sampling/estimate': samplingEstimateQuerySchema as unknown as z.ZodObject,
  'get /api/periodograms/:periodogramId': periodogramQuerySchema,
}

/** Writing routes without a JSON body (multipart uploads, actions named by the path alone). */
export const NO_JSON_BODY = new Set([
  'post /api/auth/logout', 'post /api/invitations/:token/accept', 'post /api/stars/:starId/uploads/preview', 'post /api/stars/:starId/uploads/commit',
  'post /api/sampling/:runId/cancel', 'post /api/teams/:teamId/invitations/:invitationId/approve', 'delete /api/teams/:teamId/members/:userId',
  'delete /api/teams/:teamId/invitations/:invitationId', 'delete /api/stars/:starId', 'delete /api/models/:modelId',
  'post /api/limits/:runId/cancel', 'post /api/limits/:runId/resume', 'delete /api/teams/:teamId/tokens/:tokenId',
  'post /api/teams/:teamId/stars/:starId/restore', 'post /api/teams/:teamId/survey/upload',
])

const key = (r: Route) => `${r.method} ${r.path}`

function jsonSchema(schema: Schema): Record<string, unknown> {
  const { $schema: _drop, ...rest } = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>
  return rest
}

/** Who may call a route, in words. */
export function access(r: Route): string {
  const roles = r.guards.map((g) => (g as { minRole?: string }).minRole).filter(Boolean)
  if (roles.length) return `a team member with the ${roles[0]} role or higher (owner > analyst > reviewer)`
  if (r.guards.includes(signedIn)) return 'any signed-in user'
  return 'anyone (no sign-in)'
}

function tagOf(path: string): string {
  const seg = path.split('/')[2] ?? 'api'
  return seg.replace(/s$/, '') || 'api'
}

/** The OpenAPI 3.1 document of every route in the routes table. */
export function openApiDocument(version: string): Record<string, unknown> {
  const paths: Record<string, Record<string, unknown>> = {}
  const errorResponse = { description: 'Error envelope', content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } }
  for (const r of routes) {
    const oaPath = r.path.replace(/:([A-Za-z]+)/g, '{$1}')
    const params = [...r.path.matchAll(/:([A-Za-z]+)/g)].map((m) => ({
      name: m[1], in: 'path', required: true, schema: m[1] === 'token' ? { type: 'string' } : { type: 'integer', minimum: 1 },
    }))
    const query = QUERIES[key(r)]
    const queryParams = query ? Object.entries(jsonSchema(query).properties as Record<string, unknown> ?? {}).map(([name, schema]) => ({ name, in: 'query', required: false, schema })) : []
    const body = BODIES[key(r)]
    const who = access(r)
    const op: Record<string, unknown> = {
      operationId: `${r.method}${r.path.replace(/[:/{}.-]+(\w)?/g, (_, c: string | undefined) => (c ? c.toUpperCase() : ''))}`,
      tags: [tagOf(r.path)],
      summary: `${r.method.toUpperCase()} ${r.path}`,
      description: `Who may call it: ${who}.`,
      parameters: [...params, ...queryParams],
      responses: {
        200: { description: 'OK (201 when something was created)' },
        400: errorResponse, 401: errorResponse, 403: errorResponse, 404: errorResponse, 409: errorResponse, 429: errorResponse, 503: errorResponse,
      },
      ...(who.startsWith('anyone') ? { security: [] } : {}),
    }
    if (body) op.requestBody = { required: r.method !== 'delete', content: { 'application/json': { schema: jsonSchema(body) } } }
    ;(paths[oaPath] ??= {})[r.method] = op
  }
  return {
    openapi: '3.1.0',
    info: {
      title: 'Starsway API', version,
      description: 'Radial-velocity workbench. Units: days, m/s, degrees; times are full Julian dates in the time scale each dataset records. ' +
        'Browser sessions send the session cookie and echo the CSRF cookie in the X-CSRF-Token header on unsafe methods. ' +
        'Every error is {"error": {"code", "message", "field"?}}. The role tables in the repository tests are the authority on access.',
    },
    servers: [{ url: '/' }],
    security: [{ session: [] }, { token: [] }],
    components: {
      securitySchemes: {
        session: { type: 'apiKey', in: 'cookie', name: 'starsway_session', description: 'Set by POST /api/auth/login.' },
        csrf: { type: 'apiKey', in: 'header', name: 'X-CSRF-Token', description: 'The value of the starsway_csrf cookie, on POST, PATCH and DELETE.' },
        token: { type: 'http', scheme: 'bearer', description: 'A personal API token (POST /api/teams/{teamId}/tokens), for scripts and notebooks: one team, optionally read-only; no CSRF header needed.' },
      },
      schemas: { Error: jsonSchema(errorBodySchema) },
    },
    paths,
  }
}
