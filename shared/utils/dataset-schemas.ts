/** Fields, parameters and bodies of the data set routes (upload, fit, "use these values"), shared with the forms. */
import { z } from 'zod'
import { SlugSchema } from './lab-schemas'

/** The file names a data set upload accepts. */
export const DATASET_EXTENSIONS = ['.csv', '.txt'] as const

export const DATASET_NAME_MAX_LENGTH = 200

/** Sent with the file; the name defaults to the file's name without its ending. */
export const DatasetFields = z.object({
  name: z.string().trim().min(1, { error: 'Give the data set a name' }).max(DATASET_NAME_MAX_LENGTH, { error: `Use at most ${DATASET_NAME_MAX_LENGTH} characters` }).optional(),
})

export const DatasetParams = z.object({
  lab: SlugSchema,
  system: SlugSchema,
  dataset: z.coerce.number({ error: 'The data set must be a number' }).int().positive({ error: 'The data set must be a positive number' }),
})

/** POST …/datasets/[dataset]/fit: the revision to fit (the latest by default), and weights by column header (1 by default). */
export const FitBody = z.object({
  revision: z.number().int().positive().optional(),
  weights: z.record(z.string().max(200), z.number().positive({ error: 'A weight must be above 0' }).max(1e6, { error: 'A weight must be at most 1e6' })).optional(),
})

/** POST …/datasets/[dataset]/apply: the revision the fit was made on (it must still be the latest), and the weights used. */
export const ApplyFitBody = z.object({
  baseRevision: z.number({ error: 'baseRevision must be a number' }).int().positive(),
  weights: FitBody.shape.weights,
})
