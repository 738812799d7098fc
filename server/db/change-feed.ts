import pg from 'pg'
import type { Sequelize, Transaction } from 'sequelize'
import { config } from '../config'
import { log } from '../lib/log'

/**
 * The change feed: one PostgreSQL connection per process LISTENing on `rw_changes`, which triggers of
 * migration 0061 notify at commit, whoever writes (a service, a model, raw SQL, another node). Payloads:
 *   `u:<user id>`  an account changed (any column), was deleted, or one of its sessions changed or ended;
 *   `q`            data the team's queue shows changed (cases, messages, users, rooms, room revisions).
 * The in-process caches built on it (auth/session-store.ts, data/queue-cache.ts) serve from memory only
 * while the feed is `live()`: when the connection drops they are emptied and stay off until LISTEN is
 * back, because notifications sent meanwhile are lost (PostgreSQL keeps none for an absent listener).
 * Writes made through this process's Sequelize instance are also announced here at once, without
 * waiting for PostgreSQL's notification (`watchLocalWrites`), so a request that follows a change on the
 * same node never sees the cache from before it; `u:*` then stands for "some account or session".
 */
export const CHANGES_CHANNEL = 'rw_changes'

export interface ChangeSubscriber {
  /** one notification's payload */
  change(payload: string): void
  /** the feed went down or came back: forget everything (changes may have been missed) */
  reset(): void
}

let client: pg.Client | undefined
let up = false
let retry: NodeJS.Timeout | undefined
let delay = 500
const subscribers = new Set<ChangeSubscriber>()

/** Whether the feed is listening now (a cache may serve from memory only then). */
export const feedLive = () => up

function resetAll(): void {
  for (const s of subscribers) s.reset()
}

async function connect(): Promise<void> {
  if (client || !subscribers.size) return
  const c = new pg.Client({ connectionString: config().DATABASE_URL, connectionTimeoutMillis: 3000 })
  client = c
  const lost = (why: unknown) => {
    if (client !== c) return
    client = undefined
    if (up) log.warn('change feed lost; caches off until it is back', { err: String(why) })
    up = false
    resetAll()
    c.end().catch(() => {})
    schedule()
  }
  c.on('error', lost)
  c.on('end', () => lost('connection ended'))
  c.on('notification', (n) => {
    if (n.channel !== CHANGES_CHANNEL || client !== c) return
    for (const s of subscribers) s.change(n.payload ?? '')
  })
  try {
    await c.connect()
    await c.query(`LISTEN ${CHANGES_CHANNEL}`)
    if (client !== c) return
    // anything cached before this point may have missed a change
    resetAll()
    up = true
    delay = 500
  } catch (e) {
    lost(e)
  }
}

function schedule(): void {
  if (retry || !subscribers.size) return
  retry = setTimeout(() => {
    retry = undefined
    void connect()
  }, delay)
  retry.unref()
  delay = Math.min(delay * 2, 10_000)
}

/** Subscribes to the feed (connecting it on first use); the returned function unsubscribes (and closes it after the last). */
export function subscribeChanges(s: ChangeSubscriber): () => Promise<void> {
  subscribers.add(s)
  void connect()
  return async () => {
    subscribers.delete(s)
    if (subscribers.size) return
    clearTimeout(retry)
    retry = undefined
    const c = client
    client = undefined
    up = false
    await c?.end().catch(() => {})
  }
}

/** Hands a change made in this process to the subscribers at once (its notification follows). */
export function localChange(payload: string): void {
  for (const s of subscribers) s.change(payload)
}

const READ = /^\s*(select|show|explain)\b/i
const ACCOUNTS = /\b"?(users|session)"?\b/i
const QUEUE = /\b"?(cases|messages|users|rooms|room_revisions)"?\b/i
const END = /^\s*(commit|rollback)\b/i
const pending = new WeakMap<Transaction, Set<string>>()

/**
 * Announces the writes of a Sequelize instance to this process's caches as soon as they are made and
 * again when their transaction commits (a read between the two may have cached the state before it).
 * Judged from the statement's text: conservative, a false alarm only costs a cache miss.
 */
export function watchLocalWrites(sequelize: Sequelize): void {
  sequelize.addHook('afterQuery', (options, query) => {
    const sql = (query as unknown as { sql?: unknown } | undefined)?.sql
    if (typeof sql !== 'string' || READ.test(sql)) return
    let t = options?.transaction ?? undefined
    // a savepoint's writes count at the outermost transaction's COMMIT
    while (t && (t as Transaction & { parent?: Transaction }).parent) t = (t as Transaction & { parent?: Transaction }).parent
    if (t && END.test(sql)) {
      const kinds = pending.get(t)
      pending.delete(t)
      for (const k of kinds ?? []) localChange(k)
      return
    }
    const kinds: string[] = []
    if (ACCOUNTS.test(sql)) kinds.push('u:*')
    if (QUEUE.test(sql)) kinds.push('q')
    if (!kinds.length) return
    for (const k of kinds) localChange(k)
    if (t) {
      let set = pending.get(t)
      if (!set) pending.set(t, (set = new Set()))
      for (const k of kinds) set.add(k)
    }
  })
}
