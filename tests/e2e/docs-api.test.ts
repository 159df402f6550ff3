// In the browser: /docs/api shows the API description, signed out, grouped and linked.
import { describe, expect, it } from 'vitest'
import { useBuiltServer } from '../setup/server'
import { openPage, screenshot } from '../setup/browser'

await useBuiltServer()

describe('/docs/api', () => {
  it('lists the operations by group with their body fields and answers', async () => {
    const page = await openPage('/docs/api')
    await page.getByRole('heading', { name: 'API', exact: true }).waitFor()
    await page.getByRole('heading', { name: 'API tokens' }).waitFor()
    const create = page.locator('#postMeTokens')
    expect(await create.locator('caption', { hasText: 'Body (application/json)' }).count()).toBe(1)
    expect(await create.getByRole('row', { name: /expiresInDays\s+optional\s+integer, ≥ 1, ≤ 365/ }).count()).toBe(1)
    expect(await create.getByRole('row', { name: /^403/ }).textContent()).toMatch(/API tokens cannot/)
    await create.scrollIntoViewIfNeeded()
    await screenshot(page, 'docs-api')
  })
})
