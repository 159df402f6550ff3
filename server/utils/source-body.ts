/**
 * The `{ source }` body of the stateless routes. An oversized text is a 413;
 * the body as a whole was already limited while it streamed in
 * (server/middleware/02.request-body.ts), so a huge one is never held.
 */
import type { H3Event } from 'h3'
import { z } from 'zod'
import { SOLVE_LIMITS } from './solve-limits'

export const SourceBody = z.object({
  source: z.string({ error: 'Send the Poise text as "source"' }),
})

export async function readSourceBody(event: H3Event): Promise<string> {
  const { source } = await validateBody(event, SourceBody)
  if (source.length > SOLVE_LIMITS.size.maxSourceChars) throw tooLarge()
  return source
}

function tooLarge() {
  return createError({
    statusCode: 413,
    message: `The Poise text is larger than ${SOLVE_LIMITS.size.maxSourceChars.toLocaleString('en')} characters. Split the system or move shared constants into a lab library.`,
  })
}
