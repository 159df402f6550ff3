/**
 * Data sets of a system (table `datasets`): reading an uploaded CSV, finding
 * one within the system the caller may see, and how the API shows it.
 */
import type { H3Event } from 'h3'
import { and, eq } from 'drizzle-orm'
import type { Dataset } from '../database/schema'
import { DATASET_EXTENSIONS } from '../../shared/utils/dataset-schemas'
import { UPLOAD_MAX_BYTES } from '../../shared/utils/upload-schemas'
import { parseDataSet, problemText, type DataSet } from '../../shared/fit/dataset'
import type { FitResult } from '../../shared/types/fit'
import { libraryKey, type FitTask } from '../workers/solve.worker'

/** The file of a data set upload, parsed; 400 naming each line and column when it has mistakes (nothing is stored then). */
export async function readDatasetUpload(event: H3Event): Promise<{ source: string; filename: string; fields: Record<string, string>; data: DataSet }> {
  const upload = await readTextUpload(event, {
    extensions: DATASET_EXTENSIONS, chooseMessage: 'Choose a .csv file of measurements to upload (form field "file")', defaultName: 'data.csv',
    wrongKind: (filename) => `"${filename}" is not a CSV file: choose a file ending in ${DATASET_EXTENSIONS.join(' or ')}`,
    tooLarge: (what) => createError({ statusCode: 413, message: `${what} is larger than ${UPLOAD_MAX_BYTES / 1024} KiB, the most an upload may be. Split the data set.` }),
  })
  const parsed = parseDataSet(upload.source)
  if (!parsed.ok) {
    const headers = upload.source.replace(/^\uFEFF/, '').split(/\r?\n/)[0]?.split(/[,;\t]/).map((h) => h.trim())
    const problems = parsed.problems.map((p) => ({ ...p, text: problemText(p, headers) }))
    throw createError({
      statusCode: 400,
      message: `The file was not stored: ${problems.length === 1 ? problems[0]!.text : `${problems.length} problems, the first at ${problems[0]!.text}`}`,
      data: { problems },
    })
  }
  return { ...upload, data: parsed.data }
}

/** The data set with this id in the system; 404 otherwise. */
export async function requireDataset(systemId: number, id: number): Promise<Dataset> {
  const [row] = await useDb().select().from(tables.datasets).where(and(eq(tables.datasets.systemId, systemId), eq(tables.datasets.id, id)))
  if (!row) throw createError({ statusCode: 404, message: 'No such data set in this system: it may have been deleted' })
  return row
}

/** The parsed data set stored with a row. */
export function dataOf(row: Dataset): DataSet {
  const parsed = parseDataSet(row.source)
  if (!parsed.ok) throw createError({ statusCode: 500, message: 'This data set can no longer be read; delete it and upload it again' })
  return parsed.data
}

export interface DatasetSummary {
  id: number
  name: string
  filename: string
  columns: string[]
  rowCount: number
  sha256: string
  createdBy: string | null
  createdAt: string
}

export function datasetSummary(row: Dataset, createdBy: string | null): DatasetSummary {
  return {
    id: row.id, name: row.name, filename: row.filename, columns: row.columns as string[], rowCount: row.rowCount,
    sha256: row.sha256, createdBy, createdAt: row.createdAt.toISOString(),
  }
}

/**
 * Fits a revision's text to a data set in the solver pool: the text's
 * library lookups are resolved here (the worker has no database) and sent
 * with it. 422 with the fit's message when it cannot run (nothing marked
 * `fit`, a column the model cannot predict, too few values…).
 */
export async function fitRevision(labId: number, userId: number, source: string, data: DataSet, weights: Record<string, number> | undefined): Promise<FitResult> {
  const resolver = await libraryResolverFor(labId, source)
  const libraries: FitTask['libraries'] = {}
  compileForSolve(source, { resolveLibrary: (name, revision) => (libraries[libraryKey(name, revision)] = resolver(name, revision)) })
  const outcome = await fitInPool({ source, libraries, data, weights }, userId)
  if (!outcome.ok) throw createError({ statusCode: 422, message: outcome.message })
  return outcome.fit
}
