/**
 * GET /api/labs/:lab/systems/:system/runs — the system's runs, newest first,
 * without results, and the lab's run storage (`usedBytes` of `budgetBytes`).
 */
import { z } from 'zod'

export const Params = z.object({ lab: z.string().min(1), system: z.string().min(1) })

export default defineEventHandler(async (event) => {
  const { lab, system } = validateParams(event, Params)
  const access = await requireSystem(event, lab, system, 'viewer')
  const [runs, storage] = await Promise.all([listRuns(access.system.id), labRunStorage(access.lab.id)])
  return { runs, storage }
})
