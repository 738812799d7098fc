import type { Transaction } from 'sequelize'
import { db } from './sequelize'

/**
 * Runs `fn` in one transaction. `afterCommit` callbacks (live events, nudges) run only once the
 * change is durable, so nobody is told of a change that was rolled back.
 */
export async function withTransaction<T>(fn: (t: Transaction, afterCommit: (cb: () => void) => void) => Promise<T>): Promise<T> {
  const callbacks: (() => void)[] = []
  const result = await db().transaction(async (t) => fn(t, (cb) => callbacks.push(cb)))
  for (const cb of callbacks) {
    try {
      cb()
    } catch {
      /* a failed notification must not fail the request */
    }
  }
  return result
}
