/**
 * The built server refuses to start without a site origin (links in mail and
 * the same-origin check of writes need one), and in production mode
 * (server/database/production.ts) with the published database password or
 * with demo accounts that still have the published demo password.
 */
import { inArray } from 'drizzle-orm'
import { databaseUrlProblem, isProductionMode } from '../database/production'
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../database/seed'

function refuse(reason: string): never {
  console.error(`Equipoise cannot start: ${reason}`)
  process.exit(1)
}

async function refuseOpenDemoAccounts(): Promise<void> {
  const emails = DEMO_ACCOUNTS.map((a) => a.email)
  const rows = await useDb().select({ email: tables.users.email, passwordHash: tables.users.passwordHash })
    .from(tables.users).where(inArray(tables.users.email, emails))
  const open: string[] = []
  for (const row of rows) {
    if (await verifyPassword(row.passwordHash, DEMO_PASSWORD)) open.push(row.email)
  }
  if (open.length) {
    refuse(`production mode, and the demo account${open.length > 1 ? 's' : ''} ${open.join(', ')} still sign${open.length > 1 ? '' : 's'} in with the published demo password. `
      + 'Production needs a database the demo was never seeded into (`npm run migrate` only, no `npm run seed`); '
      + 'or sign in as each of them without production mode and change its password in Settings.')
  }
}

export default defineNitroPlugin(() => {
  if (import.meta.dev) return
  if (!parseSiteUrl(String(useRuntimeConfig().public.siteUrl || ''))) refuse(SITE_URL_MISSING)
  if (!isProductionMode()) return
  const problem = databaseUrlProblem(useRuntimeConfig().database.url)
  if (problem) refuse(`production mode, and ${problem}.`)
  refuseOpenDemoAccounts().catch((error) => {
    refuse(`production mode, and the database could not be checked for demo accounts (${(error as Error).message}). Check NUXT_DATABASE_URL and that MariaDB is running.`)
  })
})
