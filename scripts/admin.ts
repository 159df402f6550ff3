// Makes an existing account a site administrator: npm run admin -- you@example.org
import { eq } from 'drizzle-orm'
import { databaseUrlFromEnv, openDatabase } from '../server/database/connect'
import { users } from '../server/database/schema'

const email = process.argv[2]?.trim().toLowerCase()
if (!email) {
  console.error('Usage: npm run admin -- you@example.org   (the account must exist: register first)')
  process.exit(2)
}
const { db, pool } = openDatabase(databaseUrlFromEnv())
try {
  const [account] = await db.select({ id: users.id, isAdmin: users.isAdmin }).from(users).where(eq(users.email, email))
  if (!account) {
    console.error(`No account uses ${email}. Create it at /register first, then run this again.`)
    process.exitCode = 1
  } else if (account.isAdmin) {
    console.log(`${email} is already a site administrator`)
  } else {
    await db.update(users).set({ isAdmin: true }).where(eq(users.id, account.id))
    console.log(`${email} is now a site administrator`)
  }
} finally {
  await pool.end()
}
