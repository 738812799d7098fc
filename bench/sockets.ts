/**
 * Live-update bench: 200 sockets in one case room; an advisor posts a reply over HTTP and the time
 * from the POST to the `case.message` event is taken on every socket. SOCKETS_COUNT, SOCKETS_REPLIES.
 * Run standalone: `npx tsx bench/sockets.ts`.
 */
import { pathToFileURL } from 'node:url'
import { io, type Socket } from 'socket.io-client'
import { benchDatabase, benchServer, percentile } from './lib/db'
import { benchUser } from './lib/people'
import type { Figure } from './index'

const COUNT = Number(process.env.SOCKETS_COUNT ?? 200)
const REPLIES = Number(process.env.SOCKETS_REPLIES ?? 20)

export async function run(): Promise<Figure[]> {
  await benchDatabase()
  const server = await benchServer()
  const sockets: Socket[] = []
  try {
    const listener = await benchUser(server.url, 'listener')
    const advisor = await benchUser(server.url, 'advisor')
    const { testRoom } = await import('../tests/helpers/rooms')
    const room = (await listener.agent.post('/api/rooms').set('X-CSRF-Token', listener.csrf).send(testRoom()).expect(201)).body
    const c = (await listener.agent.post('/api/cases').set('X-CSRF-Token', listener.csrf).send({ roomId: room.id, title: 'Bench: live updates' }).expect(201)).body
    await listener.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', listener.csrf).send({ status: 'submitted', fromStatus: 'draft' }).expect(200)
    for (let i = 0; i < COUNT; i++) {
      const s = io(server.url, { transports: ['websocket'], extraHeaders: { Cookie: i % 2 ? listener.cookie : advisor.cookie }, reconnection: false, forceNew: true })
      await new Promise<void>((res, rej) => { s.once('connect', () => res()); s.once('connect_error', rej) })
      const ack = await s.timeout(10_000).emitWithAck('case.join', { caseId: c.id })
      if (!ack.ok) throw new Error('join refused')
      sockets.push(s)
    }
    const all: number[] = []
    const lastArrival: number[] = []
    let lost = 0
    for (let r = 0; r < REPLIES; r++) {
      // bounded: a socket that misses the event counts as lost instead of hanging the bench
      const arrivals = sockets.map((s) => new Promise<number>((res) => {
        const timer = setTimeout(() => res(NaN), 10_000)
        s.once('case.message', () => { clearTimeout(timer); res(performance.now()) })
      }))
      const t0 = performance.now()
      await advisor.agent.post(`/api/cases/${c.id}/messages`).set('X-CSRF-Token', advisor.csrf).send({ body: `Bench reply ${r}` }).expect(201)
      const times = (await Promise.all(arrivals)).map((t) => t - t0)
      lost += times.filter((t) => Number.isNaN(t)).length
      const got = times.filter((t) => !Number.isNaN(t))
      all.push(...got)
      if (got.length) lastArrival.push(Math.max(...got))
    }
    return [
      { name: `reply → arrival p50 (${COUNT} sockets)`, value: percentile(all, 50), unit: 'ms' },
      { name: `reply → arrival p95 (${COUNT} sockets)`, value: percentile(all, 95), unit: 'ms', target: '≤ 50 ms' },
      { name: 'reply → last socket, median', value: percentile(lastArrival, 50), unit: 'ms' },
      { name: 'events lost (not arrived within 10 s)', value: lost, unit: 'count', target: '0' },
    ]
  } finally {
    for (const s of sockets) s.disconnect()
  }
}

if (import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const f of await run()) console.log(`${f.name}: ${f.value.toFixed(2)} ${f.unit}${f.target ? ` (target ${f.target})` : ''}`)
  process.exit(0)
}
