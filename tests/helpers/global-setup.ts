/**
 * Vitest global setup: when the test runner (server/dev/test.ts) hands us a throwaway
 * database through DATABASE_URL, bring its schema up to date once before any test file runs.
 * Unit tests run without a database, so nothing happens then.
 */
export default async function setup(): Promise<void> {
  if (!process.env.DATABASE_URL) return
  const { migrateUp } = await import('../../server/db/migrate')
  const { closeDb } = await import('../../server/db/sequelize')
  await migrateUp()
  // No connection may stay open on the database each test file clones as its template.
  await closeDb()
}
