// Seeds the demo lab and accounts into NUXT_DATABASE_URL (or the local database), once.
import { resolve } from 'node:path'
import { databaseUrlFromEnv, openDatabase } from '../server/database/connect'
import { isProductionMode } from '../server/database/production'
import { DEMO_LAB, seedDemo } from '../server/database/seed'

if (isProductionMode()) {
  console.error('Not seeding: this is production mode (EQUIPOISE_PRODUCTION=1, or NODE_ENV=production), and the demo accounts have a published password. '
    + 'Production starts from an empty database (`npm run migrate`); create the first account by registering, then `npm run admin -- you@example.org`.')
  process.exit(1)
}

const { db, pool } = openDatabase(databaseUrlFromEnv())
try {
  const { createdLab, addedSystems } = await seedDemo(db, resolve(process.cwd(), 'examples'))
  console.log(createdLab ? `Seeded "${DEMO_LAB.name}" with its demo accounts` : `"${DEMO_LAB.name}" already seeded`)
  if (addedSystems.length) console.log(`Added demo systems: ${addedSystems.join(', ')}`)
} catch (error) {
  console.error(`Could not seed the demo lab: ${(error as Error).message}`)
  process.exitCode = 1
} finally {
  await pool.end()
}
