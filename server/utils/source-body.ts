/**
 * The `{ source }` body of the stateless routes. An oversized text is a 413
 * (checked on the header first, so a huge upload is not read into memory).
 */
import type { H3Event } from 'h3'
import { z } from 'zod'
import { SOLVE_LIMITS } from './solve-limits'

export const SourceBody = z.object({
  source: z.string({ error: 'Send the Poise text as "source"' }),
})

export async function readSourceBody(event: H3Event): Promise<string> {
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > SOLVE_LIMITS.maxSourceChars * 4 + 1024) throw tooLarge()
  const { source } = await validateBody(event, SourceBody)
  if (source.length > SOLVE_LIMITS.maxSourceChars) throw tooLarge()
  return source
}

function tooLarge() {
  return createError({
    statusCode: 413,
    message: `The Poise text is larger than ${SOLVE_LIMITS.maxSourceChars.toLocaleString('en')} characters. Split the system or move shared constants into a lab library.`,
  })
}
