import type { Transaction } from './db'

/**
 * Appends one line to the audit log: who did what, in which lab. It takes the
 * transaction that makes the change, so a change and its audit line commit
 * together or not at all (a crash between them leaves neither).
 */
export async function recordAudit(tx: Transaction, entry: { actorId: number | null, labId: number | null, action: string, detail?: Record<string, unknown> }): Promise<void> {
  await tx.insert(tables.auditLog).values({
    actorId: entry.actorId,
    labId: entry.labId,
    action: entry.action,
    detail: entry.detail ? JSON.stringify(entry.detail) : null,
  })
}
