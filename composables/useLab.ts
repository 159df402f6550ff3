/** The lab named in the route, with my role in it; a missing lab shows the 404 page. */
import type { LabRole } from '#shared/utils/roles'

export interface LabSummary {
  lab: { slug: string, name: string, createdAt: string }
  role: LabRole
  memberCount: number
  systemCount: number
}

export async function useLab(slug: string) {
  const answer = await useFetch<LabSummary>(`/api/labs/${encodeURIComponent(slug)}`, { key: `lab:${slug}` })
  if (answer.error.value) {
    throw createError({ statusCode: answer.error.value.statusCode ?? 500, message: answer.error.value.data?.message, fatal: true })
  }
  return answer
}
