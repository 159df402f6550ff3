/**
 * POST /api/labs/:lab/systems/:system/runs — queue a run of a saved revision
 * (the latest unless `revision` is given) and answer at once (201) with the
 * run, `jobStatus` "queued" and its `progress`; a worker solves it and
 * stores the answer with the model it solved and the compiler and solver
 * versions (GET …/runs/:run shows how far it got, POST …/runs/:run/cancel
 * stops it). Fair use: at most SOLVE_LIMITS.jobsPerUser runs queued or
 * running per account (429 with Retry-After), at most maxJobPoints points
 * (422). Reviewers and up store runs
 * (RUN_STORE_ROLE); a viewer previews through POST /api/labs/:lab/solve,
 * which stores nothing. Libraries named by `use` resolve within the lab, and
 * the stored model records which revision of each it used. A lab whose runs
 * fill its storage budget gets 409 saying how much is used and what to do.
 */
import { z } from 'zod'
import { RUN_STORE_ROLE } from '#shared/utils/run-rules'
import { labRoleAtLeast } from '#shared/utils/roles'

export const Params = z.object({ lab: z.string().min(1), system: z.string().min(1) })
export const Body = z.object({ revision: z.number().int().positive().optional() })

export default defineEventHandler(async (event) => {
  const { lab, system } = validateParams(event, Params)
  const access = await requireSystem(event, lab, system, 'viewer')
  if (!labRoleAtLeast(access.role, RUN_STORE_ROLE)) {
    throw createError({
      statusCode: 403,
      message: `Viewers do not store runs: a viewer's Run is a preview, solved and kept nowhere (POST /api/labs/${access.lab.slug}/solve). Storing a run needs the ${RUN_STORE_ROLE} role in ${access.lab.name}.`,
    })
  }
  const { revision: number } = await validateBody(event, Body)
  const revision = number === undefined || number === access.latest.number ? access.latest : await findRevision(access.system.id, number)
  const { model } = compileForSolve(revision.source, { resolveLibrary: await libraryResolverFor(access.lab.id, revision.source) })
  await requireRunStorageRoom(access.lab.id)
  const run = await queueRun(event, access.lab.id, revision, access.user.id, model)
  setResponseStatus(event, 201)
  return sendRunWithResult(event, run, revision.number, access.user.name)
})
