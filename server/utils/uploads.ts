/**
 * Reading an uploaded `.poise` file (multipart/form-data, field "file") for
 * the import routes. The body as a whole is limited while it streams in
 * (BODY_LIMITS.uploadBytes, server/middleware/02.request-body.ts); here the
 * file itself is checked: its size, its name, and that it is UTF-8 text.
 * Each refusal says what to change.
 */
import type { H3Event } from 'h3'
import type { z } from 'zod'
import type { Lab } from '../database/schema'
import { SOURCE_MAX_LENGTH } from '../../shared/utils/lab-schemas'
import { UPLOAD_EXTENSIONS, UPLOAD_MAX_BYTES, UploadFilenameSchema } from '../../shared/utils/upload-schemas'
import type { Transaction } from './db'

export interface PoiseUpload {
  /** The text, without a byte-order mark, with Windows line ends made plain. */
  source: string
  filename: string
  /** The other (text) fields of the form. */
  fields: Record<string, string>
}

const sizeLabel = `${UPLOAD_MAX_BYTES / 1024} KiB`

function tooLarge(what: string) {
  return createError({ statusCode: 413, message: `${what} is larger than ${sizeLabel}, the most an upload may be. Split the system, or move shared constants into a lab library.` })
}

function unsupported(message: string) {
  return createError({ statusCode: 415, message })
}

export async function readPoiseUpload(event: H3Event): Promise<PoiseUpload> {
  const upload = await readTextUpload(event, {
    extensions: UPLOAD_EXTENSIONS, chooseMessage: 'Choose a .poise file to upload (form field "file")', defaultName: 'upload.poise',
    wrongKind: (filename) => `"${filename}" is not a Poise file: choose a file ending in ${UPLOAD_EXTENSIONS.join(' or ')}`,
    tooLarge,
  })
  if (upload.source.length > SOURCE_MAX_LENGTH) throw tooLarge(`"${upload.filename}"`)
  return upload
}

/** What an upload route accepts: file name endings, and its words for a missing, wrong or oversized file. */
export interface TextUploadKind {
  extensions: readonly string[]
  chooseMessage: string
  defaultName: string
  wrongKind: (filename: string) => string
  tooLarge: (what: string) => Error
}

/** One text file from a multipart form (field "file") with the form's other fields; each refusal says what to change. */
export async function readTextUpload(event: H3Event, kind: TextUploadKind): Promise<PoiseUpload> {
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (!type.toLowerCase().startsWith('multipart/form-data')) {
    throw unsupported('Send the file as multipart/form-data, in a field named "file"')
  }
  const parts = await readMultipartFormData(event).catch(() => {
    throw createError({ statusCode: 400, message: 'The upload could not be read as a form; choose the file again and resend it' })
  })
  const file = parts?.find((p) => p.name === 'file' && p.filename !== undefined)
  if (!file) throw createError({ statusCode: 400, message: kind.chooseMessage, data: { issues: [{ path: 'file', message: 'Choose a file' }] } })
  const filename = file.filename || kind.defaultName
  const named = UploadFilenameSchema.safeParse(filename)
  if (!named.success) {
    const message = named.error.issues[0]!.message
    throw createError({ statusCode: 400, message, data: { issues: [{ path: 'file', message }] } })
  }
  if (!kind.extensions.some((ext) => filename.toLowerCase().endsWith(ext))) throw unsupported(kind.wrongKind(filename))
  if (file.data.length > UPLOAD_MAX_BYTES) throw kind.tooLarge(`"${filename}"`)
  const source = decodeUtf8Text(file.data, filename)

  const fields: Record<string, string> = {}
  for (const part of parts ?? []) {
    if (part.name && part.filename === undefined) fields[part.name] = part.data.toString('utf8')
  }
  return { source, filename, fields }
}

/** The file's text; 415 when it is binary or not valid UTF-8. */
function decodeUtf8Text(data: Buffer, filename: string): string {
  if (data.includes(0)) {
    throw unsupported(`"${filename}" looks like a binary file, not text: upload the text file itself (a .poise or .csv file is plain text)`)
  }
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(data)
  } catch {
    throw unsupported(`"${filename}" is not UTF-8 text. Save it as UTF-8 in your text editor (most offer "UTF-8" under Save as / Encoding) and upload it again`)
  }
  return text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n')
}

/** Checks the text fields of an upload with a zod schema; a 400 in the shape of validateBody's. */
export function validateFields<S extends z.ZodType>(schema: S, fields: Record<string, string>): z.infer<S> {
  const present = Object.fromEntries(Object.entries(fields).filter(([, value]) => value.trim() !== ''))
  const parsed = schema.safeParse(present)
  if (parsed.success) return parsed.data
  const issues = parsed.error.issues.map((issue) => ({ path: issue.path.map(String).join('.'), message: issue.message }))
  throw createError({ statusCode: 400, message: issues[0]!.message, data: { issues } })
}

/** Adds a system row for an import, in the caller's transaction; a slug already used in the lab is a 409 saying so. */
export async function insertSystem(tx: Transaction, lab: Lab, row: { slug: string; title: string; createdBy: number }): Promise<number> {
  try {
    const [inserted] = await tx.insert(tables.systems).values({ labId: lab.id, ...row }).$returningId()
    return inserted!.id
  } catch (error) {
    if (!isDuplicateKey(error)) throw error
    throw createError({ statusCode: 409, message: `${lab.name} already has a system at "${row.slug}"; choose another address, or import the file as a new revision of that system`, data: { issues: [{ path: 'slug', message: 'Already used in this lab; choose another' }] } })
  }
}
