/**
 * Lab roles and what each may do. Pure logic shared by the server (which
 * enforces it) and the pages (which hide controls a member cannot use).
 * Order matters: each role can do everything the roles before it can.
 */
export const LAB_ROLES = ['viewer', 'reviewer', 'editor', 'owner'] as const

export type LabRole = (typeof LAB_ROLES)[number]

export function isLabRole(value: unknown): value is LabRole {
  return typeof value === 'string' && (LAB_ROLES as readonly string[]).includes(value)
}

/** Position of a role in the order viewer < reviewer < editor < owner. */
export function labRoleRank(role: LabRole): number {
  return LAB_ROLES.indexOf(role)
}

/** True when `role` is at least `minimum`. */
export function labRoleAtLeast(role: LabRole | null | undefined, minimum: LabRole): boolean {
  return role != null && labRoleRank(role) >= labRoleRank(minimum)
}

/**
 * The role a user acts with in a lab: their membership, or owner for a site
 * administrator (who can see and repair every lab), or null for an outsider.
 */
export function effectiveLabRole(membership: LabRole | null | undefined, isSiteAdmin: boolean): LabRole | null {
  if (isSiteAdmin) return 'owner'
  return membership ?? null
}

/** Plain words for what a role allows, shown beside the role picker. */
export const LAB_ROLE_DESCRIPTIONS: Record<LabRole, string> = {
  viewer: 'reads systems and results',
  reviewer: 'reads, and reviews changes',
  editor: 'creates, edits and deletes systems',
  owner: 'everything, and manages members',
}

/**
 * Whether removing or demoting one owner would leave the lab without any.
 * `ownerCount` counts the owners before the change.
 */
export function wouldLeaveNoOwner(currentRole: LabRole, nextRole: LabRole | null, ownerCount: number): boolean {
  return currentRole === 'owner' && nextRole !== 'owner' && ownerCount <= 1
}
