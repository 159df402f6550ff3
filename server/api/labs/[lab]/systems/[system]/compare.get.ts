/**
 * GET /api/labs/:lab/systems/:system/compare?from=A&to=B — both texts, the
 * model diff of their compiled models and the results diff of their answers,
 * both solved by the current solver version (stored runs are reused, missing
 * ones are solved and stored). A revision that does not compile or solve
 * still gets its text compared; `problems` says what is missing and why.
 */
import { z } from 'zod'
import { SystemParams } from '#shared/utils/lab-schemas'
import { diffModels, type ModelChange } from '#shared/diff/model-diff'
import { diffResults, incomparableReason, type ResultsDiff } from '#shared/diff/results-diff'
import type { Model } from '#shared/poise/model'

const RevisionNumber = z.coerce.number({ error: 'Give revision numbers, e.g. ?from=3&to=5' })
  .int({ error: 'A revision number is a whole number' })
  .positive({ error: 'Revision numbers start at 1' })
export const Query = z.object({ from: RevisionNumber, to: RevisionNumber })

/** The compiled model of a revision, with the lab's libraries it uses, or null with the reason in `problems`. */
async function compiledOrProblem(labId: number, source: string, number: number, problems: string[]): Promise<Model | null> {
  try {
    return compileForSolve(source, { resolveLibrary: await libraryResolverFor(labId, source) }).model
  } catch (error) {
    problems.push(`Revision ${number} cannot be solved: ${(error as { message?: string }).message ?? String(error)}`)
    return null
  }
}

export default defineEventHandler(async (event) => {
  const params = validateParams(event, SystemParams)
  const access = await requireSystem(event, params.lab, params.system, 'viewer')
  const query = validateQuery(event, Query)
  const [from, to] = await Promise.all([findRevision(access.system.id, query.from), findRevision(access.system.id, query.to)])

  const problems: string[] = []
  const fromModel = await compiledOrProblem(access.lab.id, from.source, from.number, problems)
  const toModel = await compiledOrProblem(access.lab.id, to.source, to.number, problems)
  const modelDiff: ModelChange[] | null = fromModel && toModel ? diffModels(fromModel, toModel) : null

  let resultsDiff: ResultsDiff | null = null
  let solved: { solverVersion: string; runs: { from: number; to: number }; reused: { from: boolean; to: boolean } } | null = null
  if (fromModel && toModel) {
    try {
      // One after the other: the pool is shared with everybody's runs.
      const a = await answerForRevision(from, fromModel, access.user.id)
      const b = await answerForRevision(to, toModel, access.user.id)
      const reason = incomparableReason(a.answer, b.answer)
      if (reason) problems.push(`${reason} Only the first point of each is compared.`)
      resultsDiff = diffResults(a.answer, b.answer)
      solved = { solverVersion: b.solverVersion, runs: { from: a.runId, to: b.runId }, reused: { from: a.reused, to: b.reused } }
    } catch (error) {
      problems.push(`The answers could not be compared: ${(error as { message?: string }).message ?? String(error)}`)
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
    solved,
    problems,
  }
})
