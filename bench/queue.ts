/**
 * Queue bench: 10 000 cases and 100 000 messages seeded with generate_series, then GET /api/cases
 * (the advisor's queue: first page by priority, and a full-text search) with 32 concurrent clients.
 * Run standalone: `npx tsx bench/queue.ts` (QUEUE_SECONDS, default 10; QUEUE_CASES, default 10 000).
 */
import { pathToFileURL } from 'node:url'
import { benchDatabase, benchServer } from './lib/db'
import { cannon } from './lib/cannon'
import { benchUser } from './lib/people'
import type { Figure } from './index'

const CASES = Number(process.env.QUEUE_CASES ?? 10_000)
const MESSAGES_PER_CASE = 10
const SECONDS = Number(process.env.QUEUE_SECONDS ?? 10)

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
  const words = ['bass', 'boom', 'flutter', 'echo', 'null', 'mode', 'sofa', 'corner', 'bright', 'dull', 'imaging', 'subwoofer', 'window', 'door', 'rug']
  await s.query(`
    WITH r AS (SELECT id, owner_id, row_number() OVER () AS n FROM rooms WHERE name LIKE 'Seed room %'), cnt AS (SELECT count(*) AS c FROM r)
    INSERT INTO cases (listener_id, room_id, room_revision, title, description, status, score, reply_token, submitted_at, waiting_since, last_activity_at, created_at, flag_ids)
    SELECT r.owner_id, r.id, 1,
           'Seed case ' || i || ': ' || ($2::text[])[1 + i % 15] || ' at ' || (30 + i % 70) || ' Hz',
           'The ' || ($2::text[])[1 + (i * 7) % 15] || ' and the ' || ($2::text[])[1 + (i * 11) % 15] || ' bother me.',
           (ARRAY['submitted','in_review','waiting_on_listener','plan_sent','closed','in_review']::case_status[])[1 + i % 6],
           round((random() * 10)::numeric, 2), md5(random()::text || i) || md5(i::text),
           now() - (i % 500) * interval '1 hour', CASE WHEN i % 3 = 0 THEN now() - (i % 97) * interval '1 hour' END,
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
  try {
    const advisor = await benchUser(server.url, 'advisor')
    const headers = { cookie: advisor.cookie }
    const first = await cannon({ url: `${server.url}/api/cases?scope=all&sort=priority&page=1&pageSize=25`, connections: 32, duration: SECONDS, headers })
    const search = await cannon({ url: `${server.url}/api/cases?scope=all&q=flutter%20echo&sort=waiting&page=2`, connections: 32, duration: SECONDS, headers })
    const errs = (r: typeof first) => r.errors + r.non2xx + r.timeouts
    return [
      { name: `seed ${CASES} cases + ${CASES * MESSAGES_PER_CASE} messages`, value: seedS, unit: 's' },
      { name: 'queue page p95 (32 clients)', value: first.p95, unit: 'ms', target: '< 200 ms (ours)' },
      { name: 'queue page p50', value: first.p50, unit: 'ms' },
      { name: 'queue page throughput', value: first.rps, unit: 'req/s' },
      { name: 'queue page errors', value: errs(first), unit: 'count', target: '0' },
      { name: 'queue search p95 (32 clients)', value: search.p95, unit: 'ms', target: '< 300 ms (ours)' },
      { name: 'queue search errors', value: errs(search), unit: 'count', target: '0' },
    ]
  } finally {
    // the shared bench server stays up for the next bench (bench/lib/db.ts)
  }
}

if (import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const f of await run()) console.log(`${f.name}: ${f.value.toFixed(2)} ${f.unit}${f.target ? ` (target ${f.target})` : ''}`)
  process.exit(0)
}
