/**
 * Revisions are immutable: each save of a system's source adds the next
 * number, pointing at the revision it was edited from, with a content hash.
 */
import { createHash } from 'node:crypto'
import { eq } from 'drizzle-orm'
import type { Revision } from '../database/schema'
import type { RevisionView } from '../../shared/types/system'
import type { Transaction } from './db'

export function sha256Hex(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex')
}

/** Adds the next revision inside the caller's transaction (with its audit line). */
export async function addRevision(tx: Transaction, input: {
  systemId: number
  number: number
  parentId: number | null
  source: string
  authorId: number
  message: string
}): Promise<Revision> {
  const [inserted] = await tx.insert(tables.revisions).values({ ...input, sha256: sha256Hex(input.source) }).$returningId()
  const [row] = await tx.select().from(tables.revisions).where(eq(tables.revisions.id, inserted!.id))
  return row!
}

/** The public shape of a revision in API answers. */
export function revisionView(revision: Revision, authorName: string | null): RevisionView {
  return {
    number: revision.number,
    sha256: revision.sha256,
    source: revision.source,
    message: revision.message,
    author: authorName,
    createdAt: revision.createdAt.toISOString(),
  }
}

/** True for MariaDB's duplicate-key error (a unique index refused the row). */
export function isDuplicateKey(error: unknown): boolean {
  const e = error as { code?: string, errno?: number, cause?: { code?: string } }
  return e?.code === 'ER_DUP_ENTRY' || e?.errno === 1062 || e?.cause?.code === 'ER_DUP_ENTRY'
}
