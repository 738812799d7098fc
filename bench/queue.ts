/**
 * Queue bench: 10 000 cases and 100 000 messages seeded with generate_series, then, with 32 concurrent
 * clients each: a bare Express JSON route in the same process (the yardstick), the advisor's default
 * queue first page, a full-text search, a signed-in GET /api/auth/me, and the bare route again. The
 * ratio lines divide by the mean of the two bare runs, so a machine that is busier in one part of the
 * run than another skews them less.
 * Run standalone: `npx tsx bench/queue.ts` (QUEUE_SECONDS, default 10; QUEUE_CASES, default 10 000;
 * QUEUE_CONNECTIONS, default 32).
 */
import { pathToFileURL } from 'node:url'
import { createServer } from 'node:http'
import type { AddressInfo } from 'node:net'
import express from 'express'
import { benchDatabase, benchServer } from './lib/db'
import { cannon } from './lib/cannon'
import { benchUser } from './lib/people'
import type { Figure } from './index'

const CASES = Number(process.env.QUEUE_CASES ?? 10_000)
const MESSAGES_PER_CASE = 10
const SECONDS = Number(process.env.QUEUE_SECONDS ?? 10)
const CONNECTIONS = Number(process.env.QUEUE_CONNECTIONS ?? 32)

/** The yardstick: Express with one JSON route and nothing else (no session, no helmet, no database). */
async function bareServer(): Promise<{ url: string; close: () => Promise<void> }> {
  const app = express()
  app.disable('x-powered-by')
  app.get('/bare', (_req, res) => res.json({ ok: true, at: Date.now() }))
  const http = createServer(app)
  await new Promise<void>((r) => http.listen(0, '127.0.0.1', () => r()))
  const { port } = http.address() as AddressInfo
  return { url: `http://127.0.0.1:${port}`, close: () => new Promise((r) => { http.closeAllConnections(); http.close(() => r()) }) }
}

/** The words of the seeded titles, descriptions and messages. */
export const SEED_WORDS = ['bass', 'boom', 'flutter', 'echo', 'null', 'mode', 'sofa', 'corner', 'bright', 'dull', 'imaging', 'subwoofer', 'window', 'door', 'rug']
const words = SEED_WORDS

/**
 * Search paths that differ from each other: every single seeded word, ordered pair and ordered triple
 * (2 955 searches), shuffled with a fixed seed. Taken in turn, no search repeats within one pass, which
 * at the bench's rates lasts longer than the page cache keeps a page (QUEUE_CACHE_MS), so the cache
 * cannot answer them: each is a new search, as when advisors type their own words.
 */
export function variedSearchPaths(): string[] {
  const qs: string[] = []
  for (const a of words) {
    qs.push(a)
    for (const b of words) {
      if (b === a) continue
      qs.push(`${a} ${b}`)
      for (const c of words) if (c !== a && c !== b) qs.push(`${a} ${b} ${c}`)
    }
  }
  let x = 20261203
  const rnd = () => ((x = (x * 1103515245 + 12345) % 2 ** 31) / 2 ** 31)
  for (let i = qs.length - 1; i > 0; i--) {
    const j = Math.floor(rnd() * (i + 1))
    ;[qs[i], qs[j]] = [qs[j], qs[i]]
  }
  return qs.map((q) => `/api/cases?q=${encodeURIComponent(q)}`)
}

const ROOM = { name: 'Bench room', length: 5.6, width: 3.9, height: 2.45, celsius: 20, speakers: [{ label: 'L', x: 0.8, y: 1, z: 1 }, { label: 'R', x: 0.8, y: 2.9, z: 1 }], subwoofers: [], seats: [{ label: 'Seat', x: 3.4, y: 1.95, z: 1.1 }], openings: [], surfaces: { front: 'gypsum-on-studs', back: 'gypsum-on-studs', left: 'gypsum-on-studs', right: 'gypsum-on-studs', floor: 'wood-floor-on-joists', ceiling: 'plasterboard-ceiling-on-battens' }, furnishings: [], treatments: [], notes: '' }

/** Seeds listeners, rooms, cases in every queue status and messages, all in set-based SQL. */
export async function seedQueue(cases = CASES): Promise<void> {
  const { db } = await import('../server/db/sequelize')
  const s = db()
  const listeners = Math.max(1, Math.round(cases / 20))
  await s.query(`
    INSERT INTO users (email, name, role, password_hash)
      SELECT 'seed-listener-' || i || '-' || md5(random()::text) || '@example.test', 'Seed Listener ' || i, 'listener', NULL FROM generate_series(1, $1) i
  `, { bind: [listeners] })
  await s.query(`
    WITH l AS (SELECT id, row_number() OVER () AS n FROM users WHERE email LIKE 'seed-listener-%' AND id NOT IN (SELECT owner_id FROM rooms))
    INSERT INTO rooms (owner_id, name) SELECT id, 'Seed room ' || n FROM l
  `)
  await s.query(`
    INSERT INTO room_revisions (room_id, revision, body) SELECT r.id, 1, $1::jsonb FROM rooms r WHERE NOT EXISTS (SELECT 1 FROM room_revisions x WHERE x.room_id = r.id)
  `, { bind: [JSON.stringify(ROOM)] })
  await s.query(`
    WITH r AS (SELECT id, owner_id, row_number() OVER () AS n FROM rooms WHERE name LIKE 'Seed room %'), cnt AS (SELECT count(*) AS c FROM r)
    INSERT INTO cases (listener_id, room_id, room_revision, title, description, status, score, reply_token, submitted_at, waiting_since, last_activity_at, created_at, flag_ids)
    SELECT r.owner_id, r.id, 1,
           'Seed case ' || i || ': ' || ($2::text[])[1 + i % 15] || ' at ' || (30 + i % 70) || ' Hz',
           'The ' || ($2::text[])[1 + (i * 7) % 15] || ' and the ' || ($2::text[])[1 + (i * 11) % 15] || ' bother me.',
           (ARRAY['submitted','in_review','waiting_on_listener','plan_sent','closed','in_review']::case_status[])[1 + i % 6],
           round((random() * 10)::numeric, 2), md5(random()::text || i) || md5(i::text),
           -- waiting for us only while submitted or in review (the app's rule, data/cases.ts updateStatus), 0–150 h
           now() - (i % 500) * interval '1 hour', CASE WHEN i % 6 IN (0, 1, 5) THEN now() - ((i * 37) % 151) * interval '1 hour' END,
           now() - (i % 300) * interval '1 hour', now() - (i % 500) * interval '1 hour',
           CASE WHEN i % 4 = 0 THEN ARRAY['near-square-plan'] ELSE '{}' END
      FROM generate_series(1, $1) i JOIN r ON r.n = 1 + i % (SELECT c FROM cnt)
  `, { bind: [cases, words] })
  await s.query(`
    INSERT INTO messages (case_id, author_id, body, internal, created_at)
    SELECT c.id, c.listener_id, 'Message ' || k || ': the ' || ($1::text[])[1 + k % 15] || ' near the ' || ($1::text[])[1 + (k * 3) % 15] || ' is worse at night.', k % 5 = 0, now() - k * interval '10 minutes'
      FROM cases c CROSS JOIN generate_series(1, $2) k WHERE c.title LIKE 'Seed case %'
  `, { bind: [words, MESSAGES_PER_CASE] })
  await s.query('ANALYZE')
}

export async function run(): Promise<Figure[]> {
  await benchDatabase()
  const t0 = Date.now()
  await seedQueue()
  const seedS = (Date.now() - t0) / 1000
  const server = await benchServer()
  const bare = await bareServer()
  try {
    const advisor = await benchUser(server.url, 'advisor')
    const headers = { cookie: advisor.cookie }
    const load = (url: string, h: Record<string, string> = headers) => cannon({ url, connections: CONNECTIONS, duration: SECONDS, headers: h })
    // one short warm-up of each path (JIT, plan cache, connection pools) before anything is measured
    for (const path of ['/api/cases', '/api/auth/me', '/api/cases?q=flutter%20echo&sort=waiting&page=2', '/api/cases?q=rug%20door']) await cannon({ url: `${server.url}${path}`, connections: CONNECTIONS, duration: 1, headers })
    await cannon({ url: `${bare.url}/bare`, connections: CONNECTIONS, duration: 1 })
    const bare1 = await load(`${bare.url}/bare`, {})
    // the queue's page cache (server/services/queue.ts): its share of answers is printed beside the figures,
    // since one page asked for by every client is its best case
    const { queueCacheStats } = await import('../server/services/queue')
    const share = async (run: () => ReturnType<typeof load>) => {
      // the previous run's last requests (sent before it stopped) are answered first, not counted here
      await new Promise((r) => setTimeout(r, 2000))
      const s0 = queueCacheStats()
      const r = await run()
      const s1 = queueCacheStats()
      const hits = s1.hits - s0.hits
      const all = hits + s1.misses - s0.misses
      return { ...r, cached: all ? (100 * hits) / all : NaN }
    }
    // the advisor's default view: open work, what needs an answer first, first page (no parameters)
    const first = await share(() => load(`${server.url}/api/cases`))
    const search = await share(() => load(`${server.url}/api/cases?q=flutter%20echo&sort=waiting&page=2`))
    // every request a different search (default order, first page), so the page cache cannot answer
    const paths = variedSearchPaths()
    let next = 0
    const nextPath = (req: { path: string }) => ({ ...req, path: paths[next++ % paths.length] })
    const varied = await share(() => cannon({ url: server.url, connections: CONNECTIONS, duration: SECONDS, headers, requests: [{ method: 'GET', setupRequest: nextPath }] }))
    const me = await load(`${server.url}/api/auth/me`)
    const bare2 = await load(`${bare.url}/bare`, {})
    const bareRps = (bare1.rps + bare2.rps) / 2
    const errs = (r: typeof bare1) => r.errors + r.non2xx + r.timeouts
    const pct = (r: typeof bare1) => (100 * r.rps) / bareRps
    const c = `${CONNECTIONS} clients`
    return [
      { name: `seed ${CASES} cases + ${CASES * MESSAGES_PER_CASE} messages`, value: seedS, unit: 's' },
      { name: `bare Express JSON route throughput (${c}), first run`, value: bare1.rps, unit: 'req/s' },
      { name: 'bare Express JSON route throughput, after the others', value: bare2.rps, unit: 'req/s' },
      { name: 'bare Express JSON route p95', value: Math.max(bare1.p95, bare2.p95), unit: 'ms' },
      { name: `queue first page (default view) p95 (${c})`, value: first.p95, unit: 'ms', target: '≤ 30 ms' },
      { name: 'queue first page p50', value: first.p50, unit: 'ms' },
      { name: 'queue first page throughput', value: first.rps, unit: 'req/s' },
      { name: 'queue first page errors', value: errs(first), unit: 'count', target: '0' },
      { name: 'queue first page answered from the page cache (same page for every client: its best case)', value: first.cached, unit: '%' },
      { name: `queue search p95 (${c})`, value: search.p95, unit: 'ms', target: '≤ 60 ms' },
      { name: 'queue search throughput', value: search.rps, unit: 'req/s' },
      { name: 'queue search errors', value: errs(search), unit: 'count', target: '0' },
      { name: 'queue search answered from the page cache', value: search.cached, unit: '%' },
      { name: `UNCACHED queue search, varied terms (a different search each request) p95 (${c})`, value: varied.p95, unit: 'ms', target: '≤ 60 ms' },
      { name: 'uncached queue search (varied terms) p50', value: varied.p50, unit: 'ms' },
      { name: 'uncached queue search (varied terms) throughput', value: varied.rps, unit: 'req/s' },
      { name: 'uncached queue search (varied terms) errors', value: errs(varied), unit: 'count', target: '0' },
      { name: 'uncached queue search (varied terms) answered from the page cache', value: varied.cached, unit: '%', target: '≈ 0 %' },
      { name: `signed-in /api/auth/me p95 (${c})`, value: me.p95, unit: 'ms' },
      { name: 'signed-in /api/auth/me throughput', value: me.rps, unit: 'req/s' },
      { name: 'signed-in /api/auth/me errors', value: errs(me), unit: 'count', target: '0' },
      { name: 'RATIO queue first page / bare route', value: pct(first), unit: '%', target: '≥ 40 %' },
      { name: 'RATIO queue search / bare route', value: pct(search), unit: '%' },
      { name: 'RATIO signed-in /api/auth/me / bare route', value: pct(me), unit: '%', target: '≥ 60 %' },
    ]
  } finally {
    await bare.close()
    // the shared bench server stays up for the next bench (bench/lib/db.ts)
  }
}

if (import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const f of await run()) console.log(`${f.name}: ${f.value.toFixed(2)} ${f.unit}${f.target ? ` (target ${f.target})` : ''}`)
  process.exit(0)
}
