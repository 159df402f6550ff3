/** GET /api/labs/:lab/systems/:system/runs — the system's runs, newest first, without results. */
import { z } from 'zod'

export const Params = z.object({ lab: z.string().min(1), system: z.string().min(1) })

export default defineEventHandler(async (event) => {
  const { lab, system } = validateParams(event, Params)
  const access = await requireSystem(event, lab, system, 'viewer')
  return { runs: await listRuns(access.system.id) }
})
