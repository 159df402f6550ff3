/** GET /api/labs/:lab/systems/:system/revisions/:number — one revision with its text. */
import type { RevisionAnswer } from '#shared/types/system'
export default defineEventHandler(async (event): Promise<RevisionAnswer> => {
  const params = validateParams(event, RevisionParams)
  const { system, latest } = await requireSystem(event, params.lab, params.system, 'viewer')
  const revision = await findRevision(system.id, params.number)
  const parent = revision.parentId ? (await findRevisionById(revision.parentId))?.number ?? null : null
  return { revision: { ...revisionView(revision, await authorNameOf(revision)), parent }, latestRevision: latest.number }
})
