/**
 * The one database connection pool of the server, opened on first use from
 * runtime config (NUXT_DATABASE_URL).
 */
import { openDatabase, type Database } from '../database/connect'
import * as schema from '../database/schema'

export const tables = schema

let database: Database | undefined

export function useDb(): Database {
  if (!database) database = openDatabase(useRuntimeConfig().database.url).db
  return database
}
