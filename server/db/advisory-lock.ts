import { db } from './sequelize'

/**
 * Runs `fn` while holding PostgreSQL advisory lock `key`, so concurrent start-ups (several nodes,
 * parallel test workers) take turns. The lock is transaction-scoped and held by a transaction of
 * its own, so it is taken and released on the same connection (a session lock taken through the
 * pool could be released on another one) and released even when the process dies.
 */
export async function withAdvisoryLock<T>(key: number, fn: () => Promise<T>): Promise<T> {
  return db().transaction(async (t) => {
    // raw SQL: advisory locks are PostgreSQL functions with no ORM form
    await db().query('SELECT pg_advisory_xact_lock($1)', { bind: [key], transaction: t })
    return fn()
  })
}
