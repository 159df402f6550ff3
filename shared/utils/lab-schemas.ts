/**
 * Validation of labs, members and systems, shared by API routes and pages.
 */
import { z } from 'zod'
import { LAB_ROLES } from './roles'
import { quoteTitle } from '../poise/title'

/** Lower-case letters, digits and single dashes between them: the piece of a URL. */
export const SLUG_PATTERN = /^[a-z0-9]+(?:-[a-z0-9]+)*$/

export const SlugSchema = z.string().trim()
  .min(2, { error: 'Use at least 2 characters' })
  .max(64, { error: 'Use at most 64 characters' })
  .regex(SLUG_PATTERN, { error: 'Use lower-case letters, digits and dashes, for example rinse-tank' })

export const LabRoleSchema = z.enum(LAB_ROLES, { error: `Role must be one of ${LAB_ROLES.join(', ')}` })

/** The longest Poise source we store (a generous limit against accidents). */
export const SOURCE_MAX_LENGTH = 200_000

/** The longest title of a system. */
export const TITLE_MAX_LENGTH = 200

export const SystemTitleSchema = z.string().trim()
  .min(1, { error: 'Enter a title' })
  .max(TITLE_MAX_LENGTH, { error: `Use at most ${TITLE_MAX_LENGTH} characters` })

const SourceSchema = z.string().max(SOURCE_MAX_LENGTH, { error: `Source is longer than ${SOURCE_MAX_LENGTH} characters` })

export const LabCreateBody = z.object({
  name: z.string().trim().min(1, { error: 'Enter a name for the lab' }).max(120, { error: 'Use at most 120 characters' }),
  slug: SlugSchema,
})

export const MemberUpdateBody = z.object({ role: LabRoleSchema })

export const SystemCreateBody = z.object({
  title: SystemTitleSchema,
  slug: SlugSchema,
  source: SourceSchema.optional(),
})

/** Rename, or save a new revision of the source edited from `baseRevision`. */
export const SystemUpdateBody = z.object({
  title: SystemTitleSchema.optional(),
  source: SourceSchema.optional(),
  message: z.string().trim().max(500, { error: 'Use at most 500 characters' }).optional(),
  baseRevision: z.number().int().positive().optional(),
}).refine((b) => b.title !== undefined || b.source !== undefined, { error: 'Send a new title or a new source' })
  .refine((b) => b.source === undefined || b.baseRevision !== undefined, {
    error: 'Say which revision the new source was edited from (baseRevision)',
    path: ['baseRevision'],
  })

export const LabParams = z.object({ lab: SlugSchema })
export const SystemParams = z.object({ lab: SlugSchema, system: SlugSchema })
export const MemberParams = z.object({
  lab: SlugSchema,
  user: z.coerce.number({ error: 'User must be a number' }).int().positive({ error: 'User must be a positive number' }),
})

/** The text a new system starts from when none is given: valid Poise with one comment. */
export function starterSource(title: string): string {
  return `system ${quoteTitle(title)}\n\n# Declare components, species and conditions below.\n`
}
