import { describe, expect, it } from 'vitest'
import { LoginBody, RegisterBody } from '../../../shared/utils/account-schemas'
import { titleOf } from '../../../shared/poise/title'
import { LabCreateBody, MemberParams, SlugSchema, starterSource, SystemCreateBody, SystemUpdateBody } from '../../../shared/utils/lab-schemas'
import { suggestSlug } from '../../../shared/utils/slugs'

function firstMessage(result: { success: boolean, error?: { issues: { message: string }[] } }): string | undefined {
  return result.error?.issues[0]?.message
}

describe('account schemas', () => {
  it('normalises the e-mail address to trimmed lower case', () => {
    const parsed = RegisterBody.parse({ email: '  Ana@Example.ORG ', name: ' Ana ', password: 'ten characters' })
    expect(parsed).toEqual({ email: 'ana@example.org', name: 'Ana', password: 'ten characters' })
  })

  it('explains a bad address and a short password', () => {
    expect(firstMessage(RegisterBody.safeParse({ email: 'ana', name: 'Ana', password: 'ten characters' }))).toMatch(/e-mail address/)
    expect(firstMessage(RegisterBody.safeParse({ email: 'a@b.org', name: 'Ana', password: 'short' }))).toMatch(/at least 10 characters/)
  })

  it('asks for a password at sign-in without judging its length', () => {
    expect(LoginBody.safeParse({ email: 'a@b.org', password: 'x' }).success).toBe(true)
    expect(firstMessage(LoginBody.safeParse({ email: 'a@b.org', password: '' }))).toMatch(/Enter your password/)
  })
})

describe('lab schemas', () => {
  it('accepts lower-case letters, digits and single inner dashes as an address', () => {
    for (const ok of ['demo', 'rinse-tank-2', 'ph7']) expect(SlugSchema.safeParse(ok).success, ok).toBe(true)
    for (const bad of ['Demo', 'rinse tank', '-edge', 'edge-', 'double--dash', 'ü-bad', 'a']) expect(SlugSchema.safeParse(bad).success, bad).toBe(false)
  })

  it('names the field and the fix for a bad lab', () => {
    const result = LabCreateBody.safeParse({ name: '', slug: 'Bad!' })
    expect(result.success).toBe(false)
    expect(result.error!.issues.map((i) => i.path[0])).toEqual(['name', 'slug'])
  })

  it('takes the user of a member route as a number', () => {
    expect(MemberParams.parse({ lab: 'demo', user: '12' }).user).toBe(12)
    expect(MemberParams.safeParse({ lab: 'demo', user: 'twelve' }).success).toBe(false)
  })

  it('makes the source optional when creating a system', () => {
    expect(SystemCreateBody.parse({ title: 'Rinse', slug: 'rinse' }).source).toBeUndefined()
  })

  it('requires something to change, and a base revision with a new source', () => {
    expect(SystemUpdateBody.safeParse({}).success).toBe(false)
    expect(SystemUpdateBody.safeParse({ title: 'New' }).success).toBe(true)
    const noBase = SystemUpdateBody.safeParse({ source: 'system "A"' })
    expect(noBase.success).toBe(false)
    expect(noBase.error!.issues[0]!.path).toEqual(['baseRevision'])
    expect(SystemUpdateBody.safeParse({ source: 'system "A"', baseRevision: 3 }).success).toBe(true)
  })
})

describe('starter source and suggested addresses', () => {
  it('starts a system with its title line and a comment, the title read back as written (quotes escaped)', () => {
    expect(starterSource('Nickel rinse')).toMatch(/^system "Nickel rinse"\n\n# /)
    expect(starterSource('The "best" bath')).toMatch(/^system "The \\"best\\" bath"\n/)
    expect(titleOf(starterSource('The "best" bath'))).toBe('The "best" bath')
  })

  it('suggests a valid address from a title', () => {
    expect(suggestSlug('Nickel rinse, tank 2')).toBe('nickel-rinse-tank-2')
    expect(suggestSlug('Électrolyte à pH 4')).toBe('electrolyte-a-ph-4')
    expect(SlugSchema.safeParse(suggestSlug('  Copper / Ammonia etch  ')).success).toBe(true)
  })
})
