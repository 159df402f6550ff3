/** GET /api/labs/:lab/systems/:system/revisions — every revision, newest first, with author, run status and reviews. */
import { SystemParams } from '#shared/utils/lab-schemas'
import type { RevisionListAnswer } from '#shared/types/system'

export default defineEventHandler(async (event): Promise<RevisionListAnswer> => {
  const params = validateParams(event, SystemParams)
  const { system, role, lab } = await requireSystem(event, params.lab, params.system, 'viewer')
  return {
    lab: { slug: lab.slug, name: lab.name },
    system: { slug: system.slug, title: system.title },
    role,
    revisions: await listRevisions(system.id),
  }
})
