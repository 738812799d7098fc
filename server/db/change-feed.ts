import pg from 'pg'
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
 * Before answering from memory a cache awaits `caughtUp()`: a round trip on the LISTEN connection, after
 * which every notification committed before it was asked for has been handled (PostgreSQL delivers a
 * signalled listener's pending notifications before it reports ready for the next query). So a request
 * that follows a change — on this node or any other — never gets the state from before it. Requests
 * arriving together share one round trip.
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

let syncing = false
let waiting: ((ok: boolean) => void)[] = []

function flush(c: pg.Client): void {
  const batch = waiting
  waiting = []
  syncing = true
  // raw SQL: a bare round trip on the LISTEN connection (a barrier for notifications), no table involved: the empty
  // query, which PostgreSQL answers without parsing or planning anything (EmptyQueryResponse, then ReadyForQuery)
  c.query('').then(
    () => {
      syncing = false
      const ok = up && client === c
      for (const r of batch) r(ok)
      if (waiting.length) ok ? flush(c) : settle(false)
    },
    () => {
      syncing = false
      for (const r of batch) r(false)
      settle(false)
    },
  )
}

function settle(ok: boolean): void {
  const batch = waiting
  waiting = []
  for (const r of batch) r(ok)
}

/**
 * Resolves true once every change notification committed before this call has been handled, false
 * when the feed is down (the caller then reads the database instead of its memory).
 */
export function caughtUp(): Promise<boolean> {
  const c = client
  if (!up || !c) return Promise.resolve(false)
  return new Promise((resolve) => {
    waiting.push(resolve)
    if (!syncing) flush(c)
  })
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
    settle(false)
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
    // raw SQL: LISTEN is a PostgreSQL command with no ORM form, on a pg client of its own
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
    settle(false)
    await c?.end().catch(() => {})
  }
}

