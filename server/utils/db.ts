/**
 * The one database connection pool of the server, opened on first use from
 * runtime config (NUXT_DATABASE_URL).
 */
import { openDatabase, type Database } from '../database/connect'
import * as schema from '../database/schema'

export const tables = schema

/** An open transaction; changes made through it commit together or not at all. */
export type Transaction = Parameters<Parameters<Database['transaction']>[0]>[0]

/** Where a query runs: the pool (each statement on its own) or an open transaction. */
export type DbExecutor = Database | Transaction

let database: Database | undefined

export function useDb(): Database {
  if (!database) database = openDatabase(useRuntimeConfig().database.url).db
  return database
}
