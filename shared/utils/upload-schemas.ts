/** Limits and fields of `.poise` uploads, shared by the API routes and the import form. */
import { z } from 'zod'
import { SlugSchema, SystemTitleSchema } from './lab-schemas'

/** The largest file accepted, in bytes (a Poise text is at most 200 000 characters). */
export const UPLOAD_MAX_BYTES = 256 * 1024

/** The file names an import accepts: Poise text, or plain text. */
export const UPLOAD_EXTENSIONS = ['.poise', '.txt'] as const

/** The longest file name accepted (the common limit of file systems). */
export const UPLOAD_FILENAME_MAX_LENGTH = 255

export const UploadFilenameSchema = z.string()
  .max(UPLOAD_FILENAME_MAX_LENGTH, { error: `The file name is longer than ${UPLOAD_FILENAME_MAX_LENGTH} characters; rename the file and upload it again` })

/** Fields sent with a file that becomes a new system; both optional, taken from the file when missing. */
export const ImportSystemFields = z.object({
  title: z.string().trim().max(200, { error: 'Use at most 200 characters' }).optional(),
  slug: SlugSchema.optional(),
})

/** The title and address an imported system is stored under, whether sent or taken from the file. */
export const ImportedSystem = z.object({ title: SystemTitleSchema, slug: SlugSchema })

/** Fields sent with a file that becomes the next revision of a system. */
export const ImportRevisionFields = z.object({
  message: z.string().trim().max(500, { error: 'Use at most 500 characters' }).optional(),
  baseRevision: z.coerce.number({ error: 'baseRevision must be a number' }).int().positive().optional(),
})
