/**
 * The history of a system: each revision with its author, its latest run
 * and the reviews it is part of, for the history page.
 */
import { desc, eq, inArray } from 'drizzle-orm'
import { alias } from 'drizzle-orm/mysql-core'
import type { Revision } from '../database/schema'
import type { RevisionSummary } from '../../shared/types/system'
import type { Transaction } from './db'

export async function listRevisions(systemId: number): Promise<RevisionSummary[]> {
  const db = useDb()
  const parent = alias(tables.revisions, 'parent')
  const rows = await db
    .select({ revision: tables.revisions, author: tables.users.name, parentNumber: parent.number })
    .from(tables.revisions)
    .leftJoin(tables.users, eq(tables.users.id, tables.revisions.authorId))
    .leftJoin(parent, eq(parent.id, tables.revisions.parentId))
    .where(eq(tables.revisions.systemId, systemId))
    .orderBy(desc(tables.revisions.number))
  const ids = rows.map(r => r.revision.id)
  if (!ids.length) return []

  const runs = await db.select({ id: tables.runs.id, number: tables.runs.number, revisionId: tables.runs.revisionId, status: tables.runs.status, jobStatus: tables.runs.jobStatus, solverVersion: tables.runs.solverVersion, createdAt: tables.runs.createdAt })
    .from(tables.runs).where(inArray(tables.runs.revisionId, ids)).orderBy(desc(tables.runs.id))
  const newestRun = new Map<number, RevisionSummary['run']>()
  for (const run of runs) {
    if (!newestRun.has(run.revisionId)) newestRun.set(run.revisionId, { id: run.id, number: run.number, status: run.status, jobStatus: run.jobStatus, solverVersion: run.solverVersion, createdAt: run.createdAt.toISOString() })
  }

  const against = alias(tables.revisions, 'against')
  const reviews = await db
    .select({ id: tables.reviews.id, state: tables.reviews.state, toId: tables.reviews.toRevisionId, against: against.number, reviewer: tables.users.name })
    .from(tables.reviews)
    .innerJoin(against, eq(against.id, tables.reviews.fromRevisionId))
    .leftJoin(tables.users, eq(tables.users.id, tables.reviews.reviewerId))
    .where(eq(tables.reviews.systemId, systemId))
    .orderBy(desc(tables.reviews.id))
  const reviewsOf = new Map<number, RevisionSummary['reviews']>()
  for (const r of reviews) {
    const list = reviewsOf.get(r.toId) ?? []
    list.push({ id: r.id, state: r.state, against: r.against, reviewer: r.reviewer })
    reviewsOf.set(r.toId, list)
  }

  return rows.map(({ revision, author, parentNumber }) => ({
    number: revision.number,
    parent: parentNumber ?? null,
    sha256: revision.sha256,
    message: revision.message,
    author,
    createdAt: revision.createdAt.toISOString(),
    run: newestRun.get(revision.id) ?? null,
    reviews: reviewsOf.get(revision.id) ?? [],
  }))
}

/** The author's name of a revision (null when the account is gone). */
export async function authorNameOf(revision: Revision): Promise<string | null> {
  if (!revision.authorId) return null
  const [row] = await useDb().select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.id, revision.authorId))
  return row?.name ?? null
}

/** The 409 answer for a save or restore edited from a revision that is no longer the latest: it carries both texts. */
export function staleRevisionError(latest: Revision, latestAuthor: string | null, baseRevision: number, yourSource: string | null) {
  return createError({
    statusCode: 409,
    message: `Revision ${latest.number} was saved after the revision ${baseRevision} you edited; compare your text with it and apply your change again`,
    data: { latestRevision: latest.number, latest: revisionView(latest, latestAuthor), yourSource },
  })
}

/**
 * Writes revision latest+1 of a system in one transaction with `alongside`
 * (its audit line, and any other change that must commit with it). Of two
 * saves from the same base at once, the unique (system, number) index lets
 * one win; the other gets the 409 of a stale base, naming the winner.
 */
export async function writeNextRevision(
  input: { systemId: number, latest: Revision, source: string, authorId: number, message: string },
  alongside: (tx: Transaction, revision: Revision) => Promise<void>,
): Promise<Revision> {
  const { systemId, latest, source, authorId, message } = input
  return useDb().transaction(async (tx) => {
    const revision = await addRevision(tx, { systemId, number: latest.number + 1, parentId: latest.id, source, authorId, message })
    await alongside(tx, revision)
    return revision
  }).catch(async (error) => {
    if (!isDuplicateKey(error)) throw error
    const winner = await findRevision(systemId, latest.number + 1)
    throw staleRevisionError(winner, await authorNameOf(winner), latest.number, source)
  })
}

export async function findRevisionById(id: number): Promise<Revision | null> {
  const [row] = await useDb().select().from(tables.revisions).where(eq(tables.revisions.id, id))
  return row ?? null
}
