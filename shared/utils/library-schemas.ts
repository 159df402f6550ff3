/** Validation of the lab library routes, shared by API routes and pages. */
import { z } from 'zod'
import { SlugSchema } from './lab-schemas'

export const LibraryParams = z.object({ lab: SlugSchema, name: SlugSchema })

export const LibraryRevisionParams = LibraryParams.extend({
  n: z.coerce.number({ error: 'Revision must be a number' }).int().positive({ error: 'Revision must be a whole number from 1' }),
})

/** Mark a system as a library (others may `use` it) or take the mark off. */
export const LibraryMarkBody = z.object({
  isLibrary: z.boolean({ error: 'Send isLibrary: true or false' }),
})
