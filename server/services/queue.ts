import { queuePage, type QueuePage } from '../data/queue'
import { queueQuerySchema, type QueueQuery } from '../../shared/schemas/queue'
import { AppError } from '../errors'
import { zodFields } from '../middleware/validate'
import { caughtUp, feedLive, subscribeChanges } from '../db/change-feed'
import type { User } from '../../shared/schemas/auth'

/**
 * How long a computed queue page may be answered again from memory. Short, because the priority grows
 * with the time a case waits (a quarter point an hour: at most 0.0002 points in 2 s, well below the one
 * decimal the queue shows), and it is only a bound: any change to what the queue shows (a case, a
 * message, an assignment, a name, a room) drops every cached page at once on every node, through the
 * change feed (server/db/change-feed.ts); while the feed is down nothing is cached.
 */
export const QUEUE_CACHE_MS = 2_000
const QUEUE_CACHE_MAX = 500

/**
 * A page, its JSON bytes and their ETag (the route fills it in with Express's own function), made once
 * per computed page: serialising, encoding and hashing 25 rows cost more than the rest of a cached answer.
 */
export interface CachedPage { page: QueuePage; body: Buffer; etag?: string }
interface Entry { at: number; page: CachedPage }
const pages = new Map<string, Entry>()
const computing = new Map<string, Promise<CachedPage>>()
let generation = 0
const stats = { hits: 0, misses: 0 }
let unsubscribe: (() => Promise<void>) | undefined

function forgetAll(): void {
  generation++
  pages.clear()
  // a request after a change must not wait for a page computed before it
  computing.clear()
}

function subscribe(): void {
  unsubscribe ??= subscribeChanges({ change: (p) => p === 'q' && forgetAll(), reset: forgetAll })
}

/** Stops the queue cache listening for changes (the app's close). */
export async function closeQueueCache(): Promise<void> {
  forgetAll()
  const u = unsubscribe
  unsubscribe = undefined
  await u?.()
}

/** Hits and misses of this process's queue cache since it started (for the bench and the README's description). */
export const queueCacheStats = () => ({ ...stats })

/** The cache key: the whole validated query, and the user only where the view depends on who asks ("Mine"). */
const keyOf = (user: User, q: QueueQuery) => JSON.stringify([q.scope === 'mine' ? user.id : '', q.scope, q.status ?? null, q.flag ?? null, q.waitingHours ?? null, q.q ?? null, q.sort, q.dir, q.page, q.pageSize])

async function cachedPage(user: User, query: QueueQuery): Promise<CachedPage> {
  subscribe()
  const key = keyOf(user, query)
  if (pages.has(key) || computing.has(key)) {
    // every change committed before this request is applied first (db/change-feed.ts): a page cached,
    // or being computed, before such a change is gone by then
    if (await caughtUp()) {
      const hit = pages.get(key)
      if (hit && Date.now() - hit.at <= QUEUE_CACHE_MS) {
        stats.hits++
        return hit.page
      }
      const running = computing.get(key)
      if (running) {
        stats.hits++
        return running
      }
    }
    pages.delete(key)
  }
  stats.misses++
  const g = generation
  const at = Date.now()
  const p = queuePage(user.id, query).then((page): CachedPage => ({ page, body: Buffer.from(JSON.stringify(page)) })).finally(() => {
    if (computing.get(key) === p) computing.delete(key)
  })
  computing.set(key, p)
  const page = await p
  // only what no change overtook, and only while changes can reach this node
  if (g === generation && feedLive()) {
    if (pages.size >= QUEUE_CACHE_MAX) pages.clear()
    pages.set(key, { at, page })
  }
  return page
}

/**
 * The team's queue: one page for the query parameters. The default views ("Mine", "Unassigned", "All")
 * cover open work, what needs an answer first; a status filter reaches closed cases. Pages are answered
 * from a short-lived, change-invalidated cache (QUEUE_CACHE_MS).
 */
export async function teamQueue(user: User, rawQuery: unknown): Promise<CachedPage> {
  const parsed = queueQuerySchema.safeParse(rawQuery)
  if (!parsed.success) throw new AppError('Some filters need another look', { status: 400, code: 'invalid', fields: zodFields(parsed.error.issues) })
  return cachedPage(user, parsed.data)
}
