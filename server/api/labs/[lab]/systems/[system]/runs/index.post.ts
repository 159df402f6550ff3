/**
 * POST /api/labs/:lab/systems/:system/runs — solve a saved revision (the
 * latest unless `revision` is given) and store the run. Viewers may run: a
 * run does not change the system. Libraries named by `use` resolve within the
 * lab, and the run records which revision of each it used.
 */
import { z } from 'zod'

export const Params = z.object({ lab: z.string().min(1), system: z.string().min(1) })
export const Body = z.object({ revision: z.number().int().positive().optional() })

export default defineEventHandler(async (event) => {
  const { lab, system } = validateParams(event, Params)
  const access = await requireSystem(event, lab, system, 'viewer')
  const { revision: number } = await validateBody(event, Body)
  const revision = number === undefined || number === access.latest.number ? access.latest : await findRevision(access.system.id, number)
  const { model } = compileForSolve(revision.source, { resolveLibrary: await libraryResolverFor(access.lab.id, revision.source) })
  const output = await solveInPool(model)
  const run = await storeRun(revision, access.user.id, output, model.libraries)
  setResponseStatus(event, 201)
  return sendRunWithResult(event, run, revision.number, access.user.name)
})
