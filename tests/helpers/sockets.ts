import { afterAll, beforeAll } from 'vitest'
import { io, type Socket } from 'socket.io-client'
import request from 'supertest'
import { spawn, type ChildProcess } from 'node:child_process'
import { startServer, type RunningServer } from '../../server/server'
import { freePort } from '../../server/dev/cluster'
import { clientOver, type Client } from './api'

/** This file's own server (API and sockets, no client files, no background jobs) on a free port, for its tests. */
export function useServer(): { server: RunningServer } {
  const running = {} as { server: RunningServer }
  beforeAll(async () => {
    running.server = await startServer({ port: 0, clientDir: false, background: false })
  })
  afterAll(async () => {
    await running.server?.close()
  })
  return running
}

/**
 * A second server process (`server/index.ts`) on this file's database, for tests across two nodes;
 * resolves once it says it is listening (or fails with what it printed after 60 s).
 */
export async function startOtherProcess(env: Record<string, string> = {}): Promise<{ url: string; child: ChildProcess }> {
  const port = await freePort()
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: { ...process.env, PORT: String(port), JOBS: 'off', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let out = ''
  child.stdout!.on('data', (d) => (out += d))
  child.stderr!.on('data', (d) => (out += d))
  const until = Date.now() + 60_000
  while (!/listening on/.test(out)) {
    if (Date.now() > until) throw new Error(`second process did not start:\n${out}`)
    await new Promise((r) => setTimeout(r, 200))
  }
  return { url: `http://127.0.0.1:${port}`, child }
}

/** Signs in over HTTP against a running server and returns the session cookie and CSRF token. */
export async function sessionFor(baseUrl: string, email: string, password: string): Promise<{ cookie: string; csrf: string; agent: ReturnType<typeof request.agent> }> {
  const agent = request.agent(baseUrl)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  const res = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).send({ email, password }).expect(200)
  const cookie = String(res.headers['set-cookie']).split(';')[0]
  return { cookie, csrf: body.token, agent }
}

/** A signed-in Client against a running server, with the session cookie for its sockets. */
export async function httpClient(baseUrl: string, email: string, password: string): Promise<Client & { cookie: string }> {
  const { agent, csrf, cookie } = await sessionFor(baseUrl, email, password)
  return { ...clientOver(agent, csrf), cookie }
}

export async function connectSocket(baseUrl: string, cookie?: string): Promise<Socket> {
  const s = io(baseUrl, { transports: ['websocket'], extraHeaders: cookie ? { Cookie: cookie } : {}, reconnection: false, forceNew: true })
  await new Promise<void>((resolve, reject) => {
    s.once('connect', () => resolve())
    s.once('connect_error', (e) => reject(e))
  })
  return s
}

/** One socket per session cookie, connected in that order, then each joined to the case's room. */
export async function joinedSockets(baseUrl: string, caseId: string, ...cookies: string[]): Promise<Socket[]> {
  const sockets: Socket[] = []
  for (const cookie of cookies) sockets.push(await connectSocket(baseUrl, cookie))
  for (const s of sockets) await emitAck(s, 'case.join', { caseId })
  return sockets
}

export function nextEvent<T = unknown>(s: Socket, name: string, match: (p: T) => boolean = () => true, timeoutMs = 10_000): Promise<T> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      s.off(name, on)
      reject(new Error(`no "${name}" event within ${timeoutMs} ms`))
    }, timeoutMs)
    const on = (p: T) => {
      if (!match(p)) return
      clearTimeout(timer)
      s.off(name, on)
      resolve(p)
    }
    s.on(name, on)
  })
}

export const emitAck = <T = { ok: boolean; missed?: { seq: number; kind: string }[]; error?: { code: string } }>(s: Socket, event: string, payload: unknown): Promise<T> =>
  s.timeout(10_000).emitWithAck(event, payload) as Promise<T>
