// Applies the committed migrations to NUXT_DATABASE_URL (or the local database).
import { databaseUrlFromEnv, migrateDatabase } from '../server/database/connect'

const url = databaseUrlFromEnv()
try {
  await migrateDatabase(url)
  console.log(`Migrations applied to ${url.replace(/\/\/[^@]*@/, '//')}`)
} catch (error) {
  console.error(`Could not migrate the database: ${(error as Error).message}\nIs it running? Try: npm run db -- start`)
  process.exit(1)
}
