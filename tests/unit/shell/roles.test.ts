import { describe, expect, it } from 'vitest'
import { effectiveLabRole, isLabRole, LAB_ROLES, labRoleAtLeast, wouldLeaveNoOwner } from '../../../shared/utils/roles'

describe('lab roles', () => {
  it('orders viewer < reviewer < editor < owner', () => {
    expect(LAB_ROLES).toEqual(['viewer', 'reviewer', 'editor', 'owner'])
    expect(labRoleAtLeast('editor', 'reviewer')).toBe(true)
    expect(labRoleAtLeast('reviewer', 'editor')).toBe(false)
    expect(labRoleAtLeast('owner', 'owner')).toBe(true)
    expect(labRoleAtLeast('viewer', 'viewer')).toBe(true)
  })

  it('gives no access to someone without a role', () => {
    expect(labRoleAtLeast(null, 'viewer')).toBe(false)
    expect(labRoleAtLeast(undefined, 'viewer')).toBe(false)
  })

  it('lets a site administrator act as owner of any lab, and nobody else without membership', () => {
    expect(effectiveLabRole(null, true)).toBe('owner')
    expect(effectiveLabRole('viewer', true)).toBe('owner')
    expect(effectiveLabRole(null, false)).toBeNull()
    expect(effectiveLabRole('reviewer', false)).toBe('reviewer')
  })

  it('recognises only the four role names', () => {
    expect(isLabRole('editor')).toBe(true)
    expect(isLabRole('admin')).toBe(false)
    expect(isLabRole(3)).toBe(false)
  })

  it('protects the last owner from removal and demotion, not from staying owner', () => {
    expect(wouldLeaveNoOwner('owner', null, 1)).toBe(true)
    expect(wouldLeaveNoOwner('owner', 'editor', 1)).toBe(true)
    expect(wouldLeaveNoOwner('owner', 'owner', 1)).toBe(false)
    expect(wouldLeaveNoOwner('owner', 'viewer', 2)).toBe(false)
    expect(wouldLeaveNoOwner('editor', null, 1)).toBe(false)
  })
})
