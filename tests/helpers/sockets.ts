import { io, type Socket } from 'socket.io-client'
import request from 'supertest'

/** Signs in over HTTP against a running server and returns the session cookie and CSRF token. */
export async function sessionFor(baseUrl: string, email: string, password: string): Promise<{ cookie: string; csrf: string; agent: ReturnType<typeof request.agent> }> {
  const agent = request.agent(baseUrl)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  const res = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).send({ email, password }).expect(200)
  const cookie = String(res.headers['set-cookie']).split(';')[0]
  return { cookie, csrf: body.token, agent }
}

export async function connectSocket(baseUrl: string, cookie?: string): Promise<Socket> {
  const s = io(baseUrl, { transports: ['websocket'], extraHeaders: cookie ? { Cookie: cookie } : {}, reconnection: false, forceNew: true })
  await new Promise<void>((resolve, reject) => {
    s.once('connect', () => resolve())
    s.once('connect_error', (e) => reject(e))
  })
  return s
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
