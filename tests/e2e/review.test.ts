// Two people in Chromium: an editor saves a change of a constant and asks for
// a review on the compare page; the reviewer opens the compare page, follows
// it to the review, comments on a line of the new revision and approves.
import { describe, expect, it } from 'vitest'
import { url } from '@nuxt/test-utils/e2e'
import { useBuiltServer } from '../setup/server'
import { api, makeLab, signUp } from '../setup/accounts'
import { openSignedIn, screenshot } from '../setup/browser'

await useBuiltServer()

/** Copper and one ammine complex at a fixed free ammonia (demo values). */
const ammine = (logBeta: string) => `system "Copper ammine at fixed free ammonia"
temperature 25 C
activity ideal
component Cu^2+  total 1.0 mmol/L
component NH3    free 1.0 mmol/L
reaction Cu^2+ + NH3 <=> CuNH3^2+   logbeta ${logBeta}   cite "demo value"
`

describe('review in the browser', () => {
  it('an editor asks for a review of a changed constant; the reviewer comments on a line and approves', async () => {
    const editor = await signUp('editor')
    const reviewer = await signUp('reviewer')
    const lab = await makeLab(editor, [{ who: reviewer, role: 'reviewer' }])
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Ammine rinse', slug: 'ammine', source: ammine('4.0') } })).status).toBe(201)
    const saved = await api(`/api/labs/${lab}/systems/ammine`, { method: 'PATCH', cookie: editor.cookie, body: { source: ammine('5.0'), baseRevision: 1, message: 'newer constant for CuNH3' } })
    expect(saved.status).toBe(200)

    // The editor: history → compare 1 with 2 → ask the reviewer.
    const mine = await openSignedIn(`/labs/${lab}/systems/ammine/history`, editor.cookie)
    await mine.getByRole('heading', { name: 'History of Ammine rinse' }).waitFor()
    await expect(mine.locator('[data-revision="2"]').textContent()).resolves.toContain('newer constant for CuNH3')
    await screenshot(mine, 'review-history-before')
    await mine.getByLabel('Compare revision').selectOption('1')
    await mine.getByLabel('with').selectOption('2')
    await mine.getByRole('button', { name: 'Compare' }).click()
    await mine.waitForURL(url(`/labs/${lab}/systems/ammine/compare?from=1&to=2`))
    const modelDiff = mine.getByTestId('model-diff')
    await modelDiff.waitFor()
    await expect(modelDiff.textContent()).resolves.toMatch(/CuNH₃²⁺.*logbeta 4\.00.*logbeta 5\.00.*\+1\.00/)
    await expect(mine.getByTestId('species-changes').textContent()).resolves.toMatch(/Cu²⁺/)
    await mine.locator('.cm-mergeView').waitFor()
    await screenshot(mine, 'review-compare-editor')
    await mine.getByLabel('Reviewer').selectOption({ label: `${reviewer.user.name} (reviewer)` })
    await mine.getByLabel('What to look at').fill('Is the new log beta sourced?')
    await mine.getByRole('button', { name: 'Ask for review' }).click()
    await mine.waitForURL(new RegExp(`/labs/${lab}/reviews/\\d+$`))
    await mine.getByText('waiting for review').first().waitFor()

    // The reviewer: the home page lists the review as waiting for them.
    const theirs = await openSignedIn('/', reviewer.cookie)
    const waiting = theirs.getByTestId('reviews-waiting')
    await waiting.waitFor()
    await expect(waiting.textContent()).resolves.toMatch(new RegExp(`Ammine rinse: revision 2 against 1.*asked by ${editor.user.name}`))
    await screenshot(theirs, 'review-home-waiting')

    // The compare page shows the review of this pair; open it, comment on line 6 of revision 2, approve.
    await theirs.goto(url(`/labs/${lab}/systems/ammine/compare?from=1&to=2`))
    await theirs.getByTestId('model-diff').waitFor()
    await expect(theirs.getByRole('button', { name: 'Ask for review' }).count()).resolves.toBe(0)
    await theirs.getByRole('link', { name: /waiting for review/ }).click()
    await theirs.getByRole('heading', { name: /Review of Ammine rinse: revision 2 against 1/ }).waitFor()
    await theirs.locator('.cm-mergeView').waitFor()
    // Click line number 6 on the right-hand (newer) side: it fills side and line of the comment form.
    await theirs.locator('.cm-merge-b .cm-lineNumbers .cm-gutterElement', { hasText: /^6$/ }).click()
    await expect(theirs.getByLabel('Line', { exact: true }).inputValue()).resolves.toBe('6')
    await expect(theirs.getByLabel('Side', { exact: true }).inputValue()).resolves.toBe('to')
    await theirs.getByLabel('Comment', { exact: true }).fill('Which compilation gives 5.0? Please cite it.')
    await theirs.getByRole('button', { name: 'Add comment' }).click()
    const comments = theirs.getByTestId('review-comments')
    await comments.waitFor()
    await expect(comments.textContent()).resolves.toMatch(/r2 line 6.*Which compilation gives 5\.0\?/)
    // The comment quotes the line it is about.
    await expect(comments.locator('[data-test=comment-quote]').first().textContent()).resolves.toMatch(/^reaction Cu\^2\+ \+ NH3 <=> CuNH3\^2\+\s+logbeta 5\.0\s+cite "demo value"$/)
    // The commented line carries a dot in the newer side's gutter, and only there.
    await theirs.locator('.cm-merge-b .cm-comment-marker').waitFor()
    await expect(theirs.locator('.cm-merge-a .cm-comment-marker').count()).resolves.toBe(0)
    await theirs.getByLabel('Note to the author').fill('Fine once the source is named.')
    await theirs.getByRole('button', { name: 'Approve' }).click()
    await theirs.getByRole('status').filter({ hasText: 'approved' }).waitFor()
    await screenshot(theirs, 'review-approved')
    await theirs.goto(url('/'))
    await theirs.getByText('Nothing to review.').waitFor()

    // The editor sees the decision and the comment, and the history shows the review approved.
    const review = await api(`/api/labs/${lab}/reviews?system=ammine`, { cookie: editor.cookie })
    expect(review.body.reviews[0]).toMatchObject({ state: 'approved', decisionNote: 'Fine once the source is named.' })
    await mine.goto(url(`/labs/${lab}/systems/ammine/history`))
    await expect(mine.locator('[data-revision="2"]').textContent()).resolves.toContain('approved')
    await screenshot(mine, 'review-history-after')

    // Restoring revision 1 from the history saves its text as revision 3; revision 2 stays.
    await mine.locator('[data-revision="1"]').getByRole('button', { name: 'restore' }).click()
    await mine.getByRole('status').filter({ hasText: 'Revision 1 restored as revision 3.' }).waitFor()
    await expect(mine.locator('[data-revision="3"]').textContent()).resolves.toContain('Restore revision 1')
    await expect(mine.locator('[data-revision]').count()).resolves.toBe(3)
    const restored = await api(`/api/labs/${lab}/systems/ammine/revisions/3`, { cookie: reviewer.cookie })
    expect(restored.body.revision.source).toBe(ammine('4.0'))

    // Asking for a review of revision 3 from the history starts against the last approved revision, 2.
    await mine.locator('[data-test=ask-review-3]').click()
    await expect(mine.locator('[data-test=review-base]').inputValue()).resolves.toBe('2')
    await expect(mine.locator('[data-test=review-base] option:checked').textContent()).resolves.toBe('revision 2 (approved)')
    await screenshot(mine, 'review-ask-from-history')

    // From the workbench: revision 3 has no review yet; ask for one, against revision 2 by default.
    await mine.goto(url(`/labs/${lab}/systems/ammine`))
    const panel = mine.locator('[data-test=workbench-review]')
    await panel.locator('[data-test=workbench-review-none]').waitFor()
    await panel.locator('[data-test=ask-review]').click()
    await expect(panel.locator('[data-test=review-base]').inputValue()).resolves.toBe('2')
    await panel.locator('[data-test=review-reviewer]').selectOption({ label: `${reviewer.user.name} (reviewer)` })
    await panel.locator('[data-test=review-submit]').click()
    await panel.getByRole('status').getByText(`Review asked of ${reviewer.user.name}.`).waitFor()
    await expect(panel.locator('[data-test=workbench-review-state]').textContent()).resolves.toMatch(new RegExp(`waiting for review\\s*${reviewer.user.name}, against 2`))
    await screenshot(mine, 'review-asked-from-workbench')
    const asked = await api(`/api/labs/${lab}/reviews?system=ammine&state=open`, { cookie: editor.cookie })
    expect(asked.body.reviews.map((r: { from: number, to: number }) => [r.from, r.to])).toEqual([[2, 3]])
  })

  it('overlays both revisions\' sweep curves on one diagram on the compare page', async () => {
    const editor = await signUp('editor')
    const lab = await makeLab(editor, [])
    const swept = (logBeta: string) => ammine(logBeta) + 'sweep total Cu^2+ from 0.5 mmol/L to 2 mmol/L points 11\n'
    expect((await api(`/api/labs/${lab}/systems`, { method: 'POST', cookie: editor.cookie, body: { title: 'Ammine sweep', slug: 'sweep', source: swept('4.0') } })).status).toBe(201)
    expect((await api(`/api/labs/${lab}/systems/sweep`, { method: 'PATCH', cookie: editor.cookie, body: { source: swept('5.0'), baseRevision: 1 } })).status).toBe(200)
    const page = await openSignedIn(`/labs/${lab}/systems/sweep/compare?from=1&to=2`, editor.cookie)
    await page.setViewportSize({ width: 1280, height: 900 })
    const curves = page.locator('[data-test=compare-curves]')
    await curves.waitFor()
    // It opens on the curve that moved most, with both revisions drawn.
    await expect(page.locator('[data-test=curves-quantity]').inputValue()).resolves.not.toBe('pH')
    await expect(curves.locator('[data-test=curve-from]').getAttribute('d')).resolves.toMatch(/^M[\d.]+,[\d.]+(L[\d.]+,[\d.]+){10}$/)
    await expect(curves.locator('[data-test=curve-to]').getAttribute('d')).resolves.toMatch(/^M[\d.]+,[\d.]+(L[\d.]+,[\d.]+){10}$/)
    await page.locator('[data-test=curves-quantity]').selectOption('Cu^2+')
    expect(await curves.locator('[data-test=curve-from]').getAttribute('d')).not.toBe(await curves.locator('[data-test=curve-to]').getAttribute('d'))
    await curves.screenshot({ path: 'test-results/compare-curves.png' })
    await page.setViewportSize({ width: 390, height: 800 })
    await screenshot(page, 'compare-curves-phone')
  })
})
