import request from 'supertest'
import { insertUser } from '../../server/data/users'
import { hashPassword } from '../../server/services/auth'
import type { Role } from '../../shared/schemas/auth'

export const BENCH_PASSWORD = 'bench-password-1234'

/** A user of the bench database and a signed-in session against `baseUrl`: cookie and CSRF token. */
export async function benchUser(baseUrl: string, role: Role, name = `Bench ${role}`) {
  const email = `bench-${role}-${Math.random().toString(16).slice(2, 10)}@example.test`
  const u = await insertUser({ email, name, role, passwordHash: await hashPassword(BENCH_PASSWORD) })
  const agent = request.agent(baseUrl)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  const res = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).send({ email, password: BENCH_PASSWORD }).expect(200)
  const cookie = String(res.headers['set-cookie']).split(';')[0]
  return { id: u.id, email, cookie, csrf: body.token as string, agent }
}
