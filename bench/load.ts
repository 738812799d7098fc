/**
 * Load bench: the server as its own process (server/index.ts) on loopback, autocannon scenarios at
 * LOAD_CONNECTIONS (200) for LOAD_SECONDS (60) each — queue browsing, case reading, posting
 * messages, uploads — then a memory soak: mixed traffic for LOAD_SOAK_SECONDS (600) with the
 * server's RSS sampled every 10 s. Every loop is bounded by its duration and stops by itself.
 * Run standalone: `npx tsx bench/load.ts` (e.g. LOAD_SECONDS=10 LOAD_SOAK_SECONDS=60 for a quick run).
 */
import { pathToFileURL } from 'node:url'
import { spawn } from 'node:child_process'
import { readFileSync } from 'node:fs'
import sharp from 'sharp'
import { freePort } from '../server/dev/cluster'
import { benchDatabase } from './lib/db'
import { benchUser } from './lib/people'
import { cannon, type CannonResult } from './lib/cannon'
import type { Figure } from './index'

const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 200)
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60)
const SOAK_SECONDS = Number(process.env.LOAD_SOAK_SECONDS ?? 600)
const SOAK_CONNECTIONS = Number(process.env.LOAD_SOAK_CONNECTIONS ?? 50)

const rssMb = (pid: number) => Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? NaN) / 1024

function multipart(file: Buffer, name: string) {
  const boundary = 'roomwright-bench-boundary'
  const body = Buffer.concat([Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\nContent-Type: image/png\r\n\r\n`), file, Buffer.from(`\r\n--${boundary}--\r\n`)])
  return { body, contentType: `multipart/form-data; boundary=${boundary}` }
}

export async function run(): Promise<Figure[]> {
  const url = await benchDatabase()
  const port = await freePort()
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: { ...process.env, DATABASE_URL: url, PORT: String(port), HOST: '127.0.0.1', JOBS: 'on', NODE_ENV: 'test', LOG_LEVEL: 'error', LOGIN_RATE_LIMIT: '1000000', MESSAGE_RATE_LIMIT: '10000000', UPLOAD_RATE_LIMIT: '10000000' },
    stdio: ['ignore', 'pipe', 'inherit'],
  })
  const exited = new Promise((r) => child.once('exit', r))
  const stop = () => { if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM') }
  process.once('exit', stop)
  try {
    await new Promise<void>((res, rej) => {
      const t = setTimeout(() => rej(new Error('server did not start')), 90_000)
      child.stdout!.on('data', (d) => { if (/listening on/.test(String(d))) { clearTimeout(t); res() } })
      child.once('exit', (c) => rej(new Error(`server exited ${c}`)))
    })
    const base = `http://127.0.0.1:${port}`
    const listener = await benchUser(base, 'listener')
    const advisor = await benchUser(base, 'advisor')
    const { testRoom } = await import('../tests/helpers/rooms')
    const room = (await listener.agent.post('/api/rooms').set('X-CSRF-Token', listener.csrf).send(testRoom()).expect(201)).body
    const c = (await listener.agent.post('/api/cases').set('X-CSRF-Token', listener.csrf).send({ roomId: room.id, title: 'Bench: load' }).expect(201)).body
    await listener.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', listener.csrf).send({ status: 'submitted', fromStatus: 'draft' }).expect(200)
    const photo = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#7a6' } }).png().toBuffer()
    const up = multipart(photo, 'bench.png')
    const L = { cookie: listener.cookie, 'x-csrf-token': listener.csrf }
    const scenarios: [string, () => Promise<CannonResult>][] = [
      ['queue browsing', () => cannon({ url: `${base}/api/cases?scope=all&sort=priority`, connections: CONNECTIONS, duration: SECONDS, headers: { cookie: advisor.cookie } })],
      ['case reading', () => cannon({ url: base, connections: CONNECTIONS, duration: SECONDS, headers: L, requests: [{ method: 'GET', path: `/api/cases/${c.id}` }, { method: 'GET', path: `/api/cases/${c.id}/messages` }, { method: 'GET', path: `/api/cases/${c.id}/events` }] })],
      ['posting messages', () => cannon({ url: `${base}/api/cases/${c.id}/messages`, connections: CONNECTIONS, duration: SECONDS, method: 'POST', headers: { ...L, 'content-type': 'application/json' }, body: JSON.stringify({ body: 'The boom at 41 Hz is still there after moving the sofa.' }) })],
      ['uploads (320×240 PNG)', () => cannon({ url: `${base}/api/cases/${c.id}/files`, connections: CONNECTIONS, duration: SECONDS, method: 'POST', headers: { ...L, 'content-type': up.contentType }, body: up.body })],
    ]
    const figures: Figure[] = []
    for (const [name, go] of scenarios) {
      const r = await go()
      figures.push(
        { name: `${name}: errors (${CONNECTIONS} conn, ${SECONDS} s)`, value: r.errors + r.non2xx + r.timeouts, unit: 'count', target: '0' },
        { name: `${name}: p50`, value: r.p50, unit: 'ms' },
        { name: `${name}: p95`, value: r.p95, unit: 'ms' },
        { name: `${name}: p99`, value: r.p99, unit: 'ms' },
        { name: `${name}: throughput`, value: r.rps, unit: 'req/s' },
      )
    }
    // the soak: the case's thread grows as messages are posted, so reads are bounded to the queue and the case
    const samples: number[] = [rssMb(child.pid!)]
    const sampler = setInterval(() => samples.push(rssMb(child.pid!)), 10_000)
    const soak = await cannon({ url: base, connections: SOAK_CONNECTIONS, duration: SOAK_SECONDS, headers: L, requests: [
      { method: 'GET', path: `/api/cases/${c.id}` },
      { method: 'GET', path: '/api/rooms' },
      { method: 'POST', path: `/api/cases/${c.id}/messages`, headers: { ...L, 'content-type': 'application/json' }, body: JSON.stringify({ body: 'Soak message: **still** booming' }) },
    ] })
    clearInterval(sampler)
    samples.push(rssMb(child.pid!))
    const third = Math.max(1, Math.floor(samples.length / 3))
    const early = Math.max(...samples.slice(0, third))
    const late = Math.max(...samples.slice(-third))
    figures.push(
      { name: `soak: errors (${SOAK_CONNECTIONS} conn, ${SOAK_SECONDS} s)`, value: soak.errors + soak.non2xx + soak.timeouts, unit: 'count', target: '0' },
      { name: 'soak: server RSS at start', value: samples[0], unit: 'MB' },
      { name: 'soak: server RSS, highest', value: Math.max(...samples), unit: 'MB' },
      { name: 'soak: RSS growth, last third vs first', value: late - early, unit: 'MB', target: 'steady (≈ 0)' },
    )
    return figures
  } finally {
    stop()
    await exited
  }
}

if (import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const f of await run()) console.log(`${f.name}: ${f.value.toFixed(2)} ${f.unit}${f.target ? ` (target ${f.target})` : ''}`)
  process.exit(0)
}
