/**
 * The OpenAPI 3.1 description of the API, built from ROUTES (routes.ts):
 * parameters, query and bodies come from the routes' own zod schemas through
 * zod's JSON Schema output (as the client sends them: `io: 'input'`); the
 * errors every route can give follow from who may call it and what it
 * validates. Served by GET /api/openapi.json and shown on /docs/api.
 */
import { z } from 'zod'
import { ROUTES, type Access, type RouteDoc } from './routes'
import { API_TOKEN_PREFIX } from '../../shared/utils/token-schemas'

type Json = Record<string, unknown>

function jsonSchema(schema: z.ZodType): Json {
  const out = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Json
  delete out.$schema
  return out
}

const ACCESS_TEXT: Record<Access, string> = {
  'anyone': 'Anyone (no sign-in).',
  'signed-in': 'Signed in: the session cookie or an API token.',
  'browser': 'Signed in with the session cookie only: an API token gets 403.',
  'viewer': 'A member of the lab (viewer or above), by cookie or API token.',
  'reviewer': 'A member of the lab with the reviewer role or above, by cookie or API token.',
  'editor': 'A member of the lab with the editor role or above, by cookie or API token.',
  'owner': 'An owner of the lab, by cookie or API token.',
  'admin': 'A site administrator signed in with the session cookie (404 for others, 403 to an API token).',
}

function security(access: Access): Json[] {
  if (access === 'anyone') return []
  if (access === 'browser' || access === 'admin') return [{ cookie: [] }]
  return [{ cookie: [] }, { bearer: [] }]
}

function parameters(route: RouteDoc): Json[] {
  const list: Json[] = []
  for (const [where, schema] of [['path', route.params], ['query', route.query]] as const) {
    if (!schema) continue
    const object = jsonSchema(schema) as { properties?: Record<string, Json>, required?: string[] }
    for (const [name, property] of Object.entries(object.properties ?? {})) {
      list.push({ name, in: where, required: where === 'path' || (object.required ?? []).includes(name), schema: property })
    }
  }
  return list
}

const errorResponse = (description: string) => ({ description, content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } })

function responses(route: RouteDoc): Json {
  const errors: Record<number, string> = {}
  if (route.params || route.query || route.body || route.upload) errors[400] = 'A parameter, the query or the body is not valid: `data.issues` names each field and what to change'
  if (route.access !== 'anyone') errors[401] = 'Not signed in, the session ended, or the API token is unknown, revoked or expired'
  if (route.access === 'browser') errors[403] = 'API tokens cannot do this; sign in on the website'
  else if (route.access === 'admin') errors[403] = 'API tokens cannot administer the site'
  else if (route.access !== 'anyone' && route.method !== 'get') errors[403] = 'A read-only API token' + (['viewer', 'reviewer', 'editor', 'owner'].includes(route.access) ? `, or a role below ${route.access}` : '')
  else if (['reviewer', 'editor', 'owner'].includes(route.access)) errors[403] = `A role below ${route.access}`
  if (['viewer', 'reviewer', 'editor', 'owner'].includes(route.access)) errors[404] = 'No such lab (or you are not a member), system, revision or item'
  if (route.access === 'admin') errors[404] = 'Not a site administrator'
  if (route.body || route.upload) {
    errors[413] = 'The body is larger than the limit'
    errors[415] = route.upload ? 'Not multipart/form-data' : 'Not JSON'
  }
  if (route.access !== 'anyone') errors[429] = 'Too many requests with a wrong API token from this address; `Retry-After` says when to try again'
  Object.assign(errors, route.errors)
  const ok: Json = { description: route.ok.description }
  if (route.ok.schema) ok.content = { 'application/json': { schema: jsonSchema(route.ok.schema) } }
  else ok.content = { 'application/json': { schema: { type: 'object' } } }
  const out: Json = { [String(route.ok.status)]: ok }
  for (const [status, description] of Object.entries(errors)) out[status] = errorResponse(description!)
  return out
}

function requestBody(route: RouteDoc): Json | undefined {
  if (route.body) return { required: true, content: { 'application/json': { schema: jsonSchema(route.body) } } }
  if (route.upload) {
    const fields = jsonSchema(route.upload) as { properties?: Json, required?: string[] }
    return {
      required: true,
      content: {
        'multipart/form-data': {
          schema: { type: 'object', properties: { file: { type: 'string', contentMediaType: 'text/plain', description: 'The .poise file' }, ...fields.properties }, required: ['file', ...(fields.required ?? [])] },
        },
      },
    }
  }
  return undefined
}

let cached: Json | undefined

export function openApiDocument(): Json {
  if (cached) return cached
  const paths: Record<string, Json> = {}
  for (const route of ROUTES) {
    const operation: Json = {
      tags: [route.tag],
      summary: route.summary,
      description: [route.description, ACCESS_TEXT[route.access]].filter(Boolean).join('\n\n'),
      operationId: `${route.method}${route.path.replace(/^\/api/, '').replace(/[{}]/g, '').split(/[/.-]/).map((w) => w.charAt(0).toUpperCase() + w.slice(1)).join('')}`,
      security: security(route.access),
      'x-access': route.access,
      responses: responses(route),
    }
    const params = parameters(route)
    if (params.length) operation.parameters = params
    const body = requestBody(route)
    if (body) operation.requestBody = body
    paths[route.path] ??= {}
    paths[route.path]![route.method] = operation
  }
  cached = {
    openapi: '3.1.0',
    info: {
      title: 'Equipoise API',
      version: '1',
      description: 'JSON over HTTP. Sign in with the session cookie (the website) or send a personal API token (Settings → API tokens) as `Authorization: Bearer '
        + `${API_TOKEN_PREFIX}…\`. A token has the roles of its account; a read token may only GET. Every error has the shape of the Error schema.`,
    },
    servers: [{ url: '/' }],
    security: [{ cookie: [] }, { bearer: [] }],
    tags: [...new Set(ROUTES.map((r) => r.tag))].map((name) => ({ name })),
    paths,
    components: {
      securitySchemes: {
        cookie: { type: 'apiKey', in: 'cookie', name: 'nuxt-session', description: 'The session cookie set by signing in on the website' },
        bearer: { type: 'http', scheme: 'bearer', description: `A personal API token (${API_TOKEN_PREFIX}…) made on the settings page` },
      },
      schemas: {
        Error: {
          type: 'object',
          required: ['statusCode', 'message'],
          properties: {
            statusCode: { type: 'integer' },
            message: { type: 'string', description: 'What went wrong and what to change' },
            data: {
              type: 'object',
              properties: { issues: { type: 'array', items: { type: 'object', properties: { path: { type: 'string' }, message: { type: 'string' } } } } },
              additionalProperties: true,
            },
          },
        },
      },
    },
  }
  return cached
}
