/**
 * express-rate-limit's counters in PostgreSQL (table rate_limit_hits, migration 0090), so that every node
 * of one deployment counts against the same budget: with the library's default memory store, N nodes
 * behind a balancer would each allow the whole limit (N × LOGIN_RATE_LIMIT guesses). The client key is
 * kept only as a SHA-256 (it may be an e-mail address), prefixed by the limiter's name so that limiters
 * keep separate budgets. Windows are fixed (as the memory store's) and timed by the database's clock,
 * so nodes whose clocks differ still agree. Expired rows are deleted now and then by whichever node
 * increments (at most once per SWEEP_EVERY_MS per process).
 */
import { createHash } from 'node:crypto'
import { Op, QueryTypes, fn } from 'sequelize'
import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit'
import { db } from '../db/sequelize'
import { models } from '../db/models'
import { log } from '../lib/log'

export const SWEEP_EVERY_MS = 10 * 60_000
let lastSweep = 0

/** Deletes every counter whose window has ended; returns how many. */
export async function sweepRateLimits(): Promise<number> {
  lastSweep = Date.now()
  return models().RateLimitHit.destroy({ where: { resetAt: { [Op.lte]: fn('now') } } })
}

export class PostgresRateLimitStore implements Store {
  /** Counts are in the database, shared by every node (the library then skips its one-process checks). */
  readonly localKeys = false
  readonly prefix: string
  private windowMs = 60_000

  constructor(name: string) {
    if (!/^[a-z0-9-]{1,30}$/.test(name)) throw new Error(`rate limiter name "${name}" must be 1–30 of a-z 0-9 -`)
    this.prefix = `${name}:`
  }

  init(options: Options): void {
    this.windowMs = options.windowMs
  }

  private rowKey(key: string): string {
    return this.prefix + createHash('sha256').update(key, 'utf8').digest('hex')
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const row = await models().RateLimitHit.findOne({ where: { key: this.rowKey(key), resetAt: { [Op.gt]: fn('now') } } })
    return row ? { totalHits: row.hits, resetTime: row.resetAt } : undefined
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const { RateLimitHit } = models()
    if (Date.now() - lastSweep > SWEEP_EVERY_MS) {
      void sweepRateLimits().catch((err) => log.warn('rate-limit sweep failed', { err: String(err) }))
    }
    // Raw SQL: one atomic INSERT … ON CONFLICT DO UPDATE with a CASE (start a new window once the old one
    // ended), which Model.upsert cannot say; two nodes incrementing the same key at once must both count.
    const [row] = await db().query<{ hits: number; reset_at: Date }>(
      `INSERT INTO ${RateLimitHit.getTableName() as string} AS r (key, hits, reset_at)
         VALUES ($1, 1, now() + $2 * interval '1 millisecond')
       ON CONFLICT (key) DO UPDATE SET
         hits = CASE WHEN r.reset_at <= now() THEN 1 ELSE r.hits + 1 END,
         reset_at = CASE WHEN r.reset_at <= now() THEN EXCLUDED.reset_at ELSE r.reset_at END
       RETURNING hits, reset_at`,
      { bind: [this.rowKey(key), this.windowMs], type: QueryTypes.SELECT },
    )
    return { totalHits: row.hits, resetTime: new Date(row.reset_at) }
  }

  async decrement(key: string): Promise<void> {
    await models().RateLimitHit.decrement('hits', { by: 1, where: { key: this.rowKey(key), hits: { [Op.gt]: 0 }, resetAt: { [Op.gt]: fn('now') } } })
  }

  async resetKey(key: string): Promise<void> {
    await models().RateLimitHit.destroy({ where: { key: this.rowKey(key) } })
  }

  async resetAll(): Promise<void> {
    await models().RateLimitHit.destroy({ where: { key: { [Op.startsWith]: this.prefix } } })
  }
}
