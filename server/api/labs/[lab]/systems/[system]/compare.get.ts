/**
 * GET /api/labs/:lab/systems/:system/compare?from=A&to=B — both texts, the
 * model diff and the results diff of the two revisions. A compare reads and
 * never writes: each side is the revision's newest stored run (its stored
 * model and answer, exactly as solved), or, when the revision has no stored
 * run, the revision compiled and solved now in memory and not stored
 * (`solved.from/to.origin` says which). A revision that does not compile or
 * solve still gets its text compared; `problems` says what is missing and
 * why, and when the two sides come from different compiler or solver versions.
 */
import { z } from 'zod'
import { SystemParams } from '#shared/utils/lab-schemas'
import { diffModels, type ModelChange } from '#shared/diff/model-diff'
import { diffResults, incomparableReason, type ResultsDiff } from '#shared/diff/results-diff'
import { compareCurves } from '#shared/diff/curves'
import type { CompareAnswer } from '#shared/types/compare'

const RevisionNumber = z.coerce.number({ error: 'Give revision numbers, e.g. ?from=3&to=5' })
  .int({ error: 'A revision number is a whole number' })
  .positive({ error: 'Revision numbers start at 1' })
export const Query = z.object({ from: RevisionNumber, to: RevisionNumber })

export default defineEventHandler(async (event): Promise<CompareAnswer> => {
  const params = validateParams(event, SystemParams)
  const access = await requireSystem(event, params.lab, params.system, 'viewer')
  const query = validateQuery(event, Query)
  const [from, to] = await Promise.all([findRevision(access.system.id, query.from), findRevision(access.system.id, query.to)])

  const problems: string[] = []
  // One after the other: a side with no stored run is solved in the pool shared with everybody's runs.
  const a = await answerForRevision(access.lab.id, from, access.user.id, problems)
  const b = await answerForRevision(access.lab.id, to, access.user.id, problems)
  const modelDiff: ModelChange[] | null = a.model && b.model ? diffModels(a.model, b.model) : null
  if (modelDiff && a.side.compilerVersion && b.side.compilerVersion && a.side.compilerVersion !== b.side.compilerVersion) {
    problems.push(`The model of revision ${from.number} was made by compiler ${a.side.compilerVersion} and that of revision ${to.number} by compiler ${b.side.compilerVersion}: part of the model difference may come from the compiler, not the text. Store a new run of the older one to compare like with like.`)
  }

  let resultsDiff: ResultsDiff | null = null
  if (a.answer && b.answer) {
    const reason = incomparableReason(a.answer, b.answer)
    if (reason) problems.push(`${reason} Only the first point of each is compared.`)
    resultsDiff = diffResults(a.answer, b.answer)
    if (a.side.solverVersion !== b.side.solverVersion) {
      problems.push(`Revision ${from.number} was solved by solver ${a.side.solverVersion} and revision ${to.number} by solver ${b.side.solverVersion}: part of the difference may come from the solver, not the text. Store a new run of the older one to compare like with like.`)
    }
  }

  return {
    lab: { slug: access.lab.slug, name: access.lab.name },
    system: { slug: access.system.slug, title: access.system.title },
    role: access.role,
    latestRevision: access.latest.number,
    from: revisionView(from, await authorNameOf(from)),
    to: revisionView(to, await authorNameOf(to)),
    modelDiff,
    resultsDiff,
    curves: a.answer && b.answer ? compareCurves(a.answer, b.answer) : null,
    solved: a.answer || b.answer ? { solverVersion: b.side.solverVersion, from: a.side, to: b.side } : null,
    problems,
  }
})
