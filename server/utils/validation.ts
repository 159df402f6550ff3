/**
 * Request validation with one error shape: 400 with a message saying what to
 * change, plus `data.issues` (field path and message) for forms to show inline.
 */
import type { H3Event } from 'h3'
import type { z } from 'zod'

export interface FieldIssue {
  path: string
  message: string
}

function badRequest(error: z.ZodError): never {
  const issues: FieldIssue[] = error.issues.map((issue) => ({
    path: issue.path.map(String).join('.'),
    message: issue.message,
  }))
  // The message is for a person: the first issue's own words, which say what to change. Which field it
  // concerns is in `data.issues`, never written into the sentence as a schema's key ("token: …").
  const message = issues[0]?.message ?? 'The request is not valid'
  throw createError({ statusCode: 400, statusMessage: 'Bad Request', message, data: { issues } })
}

function check<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const parsed = schema.safeParse(value)
  if (!parsed.success) badRequest(parsed.error)
  return parsed.data
}

/** Reads the JSON body and validates it; a missing or unreadable body is a 400 too. */
export async function validateBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  } catch {
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'Send the request body as JSON' })
  }
  return check(schema, body ?? {})
}

export function validateParams<S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> {
  return check(schema, getRouterParams(event, { decode: true }))
}

export function validateQuery<S extends z.ZodType>(event: H3Event, schema: S): z.infer<S> {
  return check(schema, getQuery(event))
}
