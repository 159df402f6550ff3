/** Appends one line to the audit log: who did what, in which lab. */
export async function recordAudit(entry: { actorId: number | null, labId: number | null, action: string, detail?: Record<string, unknown> }): Promise<void> {
  await useDb().insert(tables.auditLog).values({
    actorId: entry.actorId,
    labId: entry.labId,
    action: entry.action,
    detail: entry.detail ? JSON.stringify(entry.detail) : null,
  })
}
