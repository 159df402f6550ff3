/**
 * The OpenAPI description: every file under server/api/ has its operation
 * (with a parameter for each [name] of its path, and a request body when the
 * route reads one), nothing is described that has no file, and /docs/api
 * shows it.
 */
import { readdirSync, readFileSync } from 'node:fs'
import { join, relative } from 'node:path'
import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { api } from '../setup/accounts'

await useBuiltServer()

const apiDir = new URL('../../server/api/', import.meta.url).pathname

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => e.isDirectory() ? files(join(dir, e.name)) : [join(dir, e.name)])
}

/** `labs/[lab]/systems/index.post.ts` → post /api/labs/{lab}/systems. */
function operationOf(file: string): { method: string, path: string, text: string } {
  const rel = relative(apiDir, file).replace(/\\/g, '/')
  const match = /^(.*)\.(get|post|put|patch|delete)\.ts$/.exec(rel)
  if (!match) throw new Error(`${rel}: a route file is named NAME.METHOD.ts`)
  const path = `/api/${match[1]}`.replace(/\/index$/, '').replace(/\[([^\]]+)\]/g, '{$1}')
  return { method: match[2]!, path, text: readFileSync(file, 'utf8') }
}

describe('GET /api/openapi.json', async () => {
  const answer = await api('/api/openapi.json')
  const doc = answer.body as { openapi: string, paths: Record<string, Record<string, any>>, components: { securitySchemes: Record<string, any> } }
  const routes = files(apiDir).map(operationOf)

  it('is an OpenAPI 3.1 document, public, with the cookie and bearer security schemes', () => {
    expect(answer.status).toBe(200)
    expect(doc.openapi).toBe('3.1.0')
    expect(doc.components.securitySchemes.cookie).toMatchObject({ type: 'apiKey', in: 'cookie' })
    expect(doc.components.securitySchemes.bearer).toMatchObject({ type: 'http', scheme: 'bearer' })
  })

  it('describes every file under server/api/, with its path parameters and body', () => {
    expect(routes.length).toBeGreaterThan(50)
    const missing = routes.filter((r) => !doc.paths[r.path]?.[r.method]).map((r) => `${r.method.toUpperCase()} ${r.path}`)
    expect(missing).toEqual([])
    for (const route of routes) {
      const operation = doc.paths[route.path]![route.method]
      const names = [...route.path.matchAll(/\{([^}]+)\}/g)].map((m) => m[1])
      const inPath = (operation.parameters ?? []).filter((p: { in: string }) => p.in === 'path').map((p: { name: string }) => p.name)
      expect(inPath.sort(), `${route.method} ${route.path}`).toEqual(names.sort())
      const readsBody = /validateBody\(|readSourceBody\(|readPoiseUpload\(|readDatasetUpload\(|readBody\(/.test(route.text)
      expect(Boolean(operation.requestBody), `${route.method} ${route.path} body`).toBe(readsBody)
      expect(Object.keys(operation.responses).some((s) => s.startsWith('2')), `${route.method} ${route.path} answer`).toBe(true)
      expect(Array.isArray(operation.security)).toBe(true)
    }
  })

  it('describes nothing that has no route file', () => {
    const known = new Set(routes.map((r) => `${r.method} ${r.path}`))
    const extra = Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((m) => `${m} ${path}`)).filter((k) => !known.has(k))
    expect(extra).toEqual([])
  })

  it('takes the bodies from the routes\' zod schemas, and marks what a token may not do', () => {
    const create = doc.paths['/api/me/tokens']!.post
    expect(create.requestBody.content['application/json'].schema).toMatchObject({
      type: 'object',
      required: ['name', 'scope'],
      properties: { name: { type: 'string', minLength: 1, maxLength: 80 }, scope: { enum: ['read', 'write'] }, expiresInDays: { type: 'integer', minimum: 1, maximum: 365 } },
    })
    expect(create.security).toEqual([{ cookie: [] }])
    expect(create.responses['201'].content['application/json'].schema.required).toContain('token')
    const save = doc.paths['/api/labs/{lab}/systems/{system}']!.patch
    expect(save.security).toEqual([{ cookie: [] }, { bearer: [] }])
    expect(Object.keys(save.responses)).toEqual(expect.arrayContaining(['200', '400', '401', '403', '404', '409']))
    const run = doc.paths['/api/labs/{lab}/systems/{system}/runs']!.post.responses['201'].content['application/json'].schema
    expect(run.required).toEqual(expect.arrayContaining(['id', 'revision', 'status', 'kind', 'libraries', 'result', 'model', 'compilerVersion', 'storedBytes']))
    // How the solve came out, null until the run's job is done; the job's own status beside it.
    expect(run.properties.status.anyOf).toEqual([{ type: 'string', enum: ['ok', 'failed', 'diverged'] }, { type: 'null' }])
    expect(run.properties.jobStatus.enum).toEqual(['queued', 'running', 'done', 'failed', 'cancelled'])
    expect(run.required).toEqual(expect.arrayContaining(['jobStatus', 'progress', 'queuedAt', 'startedAt', 'finishedAt', 'worker', 'jobError']))
    const system = doc.paths['/api/labs/{lab}/systems/{system}']!.get.responses['200'].content['application/json'].schema
    expect(system.properties.system.properties.latest.required).toEqual(expect.arrayContaining(['number', 'source']))
    expect(doc.paths['/api/labs/{lab}/systems/{system}/compare']!.get.parameters.filter((p: { in: string }) => p.in === 'query').map((p: { name: string }) => p.name)).toEqual(['from', 'to'])
  })
})

describe('/docs/api', () => {
  it('shows every operation of the description, signed out', async () => {
    const response = await fetch(url('/docs/api'))
    expect(response.status).toBe(200)
    const html = await response.text()
    expect(html).toContain('POST</span> /api/me/tokens')
    expect(html).toContain('PATCH</span> /api/labs/{lab}/systems/{system}')
    expect(html.match(/data-test="operation"/g)?.length).toBe(files(apiDir).length)
  })
})
