/**
 * Bench: the largest room the engine accepts, while other requests go on. The in-process server
 * answers previews of the worst accepted room (ROOM_LIMITS) in a loop for ENGINE_WORST_SECONDS (8);
 * meanwhile the event-loop delay (perf_hooks.monitorEventLoopDelay) is sampled and health, sign-in and
 * the queue are requested one after another, their latencies taken. The same figures at rest come first.
 * Run standalone: `npx tsx bench/engine-worst.ts`.
 */
import { pathToFileURL } from 'node:url'
import { monitorEventLoopDelay, performance } from 'node:perf_hooks'
import request from 'supertest'
import { benchDatabase, benchServer, percentile } from './lib/db'
import { BENCH_PASSWORD, benchUser } from './lib/people'
import type { Figure } from './index'

const SECONDS = Number(process.env.ENGINE_WORST_SECONDS ?? 8)

async function timed(fn: () => Promise<unknown>): Promise<number> {
  const t = performance.now()
  await fn()
  return performance.now() - t
}

export async function run(): Promise<Figure[]> {
  await benchDatabase()
  const server = await benchServer()
  const { largestAcceptedRoom, hardestAcceptedRoom } = await import('../tests/fixtures/worst-rooms')
  const { roomSchema } = await import('../shared/schemas/room')
  const { computeRoomAnalysis } = await import('../shared/acoustics')
  const listener = await benchUser(server.url, 'listener')
  const advisor = await benchUser(server.url, 'advisor')
  const signer = await benchUser(server.url, 'listener')
  const worst = largestAcceptedRoom()

  const signInOnce = async () => {
    const a = request.agent(server.url)
    const { body } = await a.get('/api/auth/csrf').expect(200)
    await a.post('/api/auth/login').set('X-CSRF-Token', body.token).send({ email: signer.email, password: BENCH_PASSWORD }).expect(200)
  }
  const probes = {
    health: () => request(server.url).get('/api/health').expect(200),
    'sign-in': signInOnce,
    queue: () => advisor.agent.get('/api/cases?scope=all&pageSize=25').expect(200),
  }
  // fetch, body read as bytes: parsing a megabyte of JSON here would load the server's own event loop (same process)
  const preview = async (room: object) => {
    const res = await fetch(`${server.url}/api/rooms/preview`, { method: 'POST', headers: { 'content-type': 'application/json', cookie: listener.cookie, 'x-csrf-token': listener.csrf }, body: JSON.stringify(room) })
    await res.arrayBuffer()
    if (res.status !== 200) throw new Error(`preview answered ${res.status}`)
  }

  // at rest
  await preview(worst) // the worker starts and warms up
  const rest: Record<string, number[]> = { health: [], 'sign-in': [], queue: [] }
  const restLoop = monitorEventLoopDelay({ resolution: 10 })
  restLoop.enable()
  for (let i = 0; i < 10; i++) for (const [k, f] of Object.entries(probes)) rest[k].push(await timed(f))
  restLoop.disable()

  // during: previews of the worst accepted room back to back, probes one after another
  const during: Record<string, number[]> = { health: [], 'sign-in': [], queue: [] }
  const previewMs: number[] = []
  const loop = monitorEventLoopDelay({ resolution: 10 })
  loop.enable()
  const until = performance.now() + SECONDS * 1000
  const computing = (async () => { while (performance.now() < until) previewMs.push(await timed(() => preview(worst))) })()
  while (performance.now() < until) for (const [k, f] of Object.entries(probes)) during[k].push(await timed(f))
  await computing
  loop.disable()
  const hardMs: number[] = []
  for (let i = 0; i < 5; i++) hardMs.push(await timed(() => preview(hardestAcceptedRoom())))

  // for comparison: the same analysis on this thread, as the server did before it moved to the worker
  const parsed = roomSchema.parse(worst)
  const inline: number[] = []
  for (let i = 0; i < 5; i++) inline.push(await timed(async () => computeRoomAnalysis(parsed)))

  const ms = (ns: number) => ns / 1e6
  return [
    { name: 'worst accepted room: preview (worker), median', value: percentile(previewMs, 50), unit: 'ms', target: '< 1000 ms' },
    { name: 'worst accepted room: preview (worker), p95', value: percentile(previewMs, 95), unit: 'ms' },
    { name: 'hardest accepted room (16 000-mode table): preview, median', value: percentile(hardMs, 50), unit: 'ms' },
    { name: 'worst room on the event loop instead (before), median', value: percentile(inline, 50), unit: 'ms' },
    { name: 'event-loop delay at rest (same probes), p99', value: ms(restLoop.percentile(99)), unit: 'ms' },
    { name: 'event-loop delay during worst previews, p99', value: ms(loop.percentile(99)), unit: 'ms', target: '< 100 ms' },
    { name: 'event-loop delay during worst previews, max', value: ms(loop.max), unit: 'ms' },
    ...(['health', 'sign-in', 'queue'] as const).flatMap((k) => [
      { name: `${k} at rest, p50`, value: percentile(rest[k], 50), unit: 'ms' },
      { name: `${k} during worst previews, p50 (${during[k].length} requests)`, value: percentile(during[k], 50), unit: 'ms' },
      { name: `${k} during worst previews, p95`, value: percentile(during[k], 95), unit: 'ms' },
    ]),
  ]
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const figures = await run()
  for (const f of figures) console.log(`${f.name.padEnd(70)} ${Number.isFinite(f.value) ? f.value.toFixed(1) : '—'} ${f.unit}${f.target ? `  (target ${f.target})` : ''}`)
  process.exit(0)
}
