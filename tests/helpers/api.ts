import request from 'supertest'
import { randomUUID } from 'node:crypto'
import { createApp, type BuiltApp } from '../../server/app'
import { insertUser } from '../../server/data/users'
import { hashPassword } from '../../server/services/auth'
import type { Role, User } from '../../shared/schemas/auth'

export const TEST_PASSWORD = 'correct-horse-battery-7'

let built: BuiltApp | undefined
/** The Express app in-process (no client files), shared by one test file. */
export function testApp(): BuiltApp['app'] {
  built ??= createApp({ clientDir: false })
  return built.app
}
export async function closeTestApp(): Promise<void> {
  await built?.close()
  built = undefined
  const { closeDb } = await import('../../server/db/sequelize')
  await closeDb()
}

/** A distinctive e-mail per call, so tests running side by side never collide. */
export const uniqueEmail = (tag: string) => `${tag}-${randomUUID().slice(0, 8)}@example.test`

let hashed: Promise<string> | undefined
export async function makeUser(role: Role, name = `Test ${role}`): Promise<User & { password: string }> {
  hashed ??= hashPassword(TEST_PASSWORD)
  const u = await insertUser({ email: uniqueEmail(role), name, role, passwordHash: await hashed })
  return { id: u.id, email: u.email, name: u.name, role: u.role, password: TEST_PASSWORD }
}

export interface Client {
  agent: ReturnType<typeof request.agent>
  csrf: string
  get: (url: string) => request.Test
  post: (url: string, body?: unknown) => request.Test
  put: (url: string, body?: unknown) => request.Test
  patch: (url: string, body?: unknown) => request.Test
  delete: (url: string) => request.Test
}

/** The Client methods over one cookie-keeping agent, each write carrying the CSRF token. */
export function clientOver(agent: ReturnType<typeof request.agent>, csrf: string): Client {
  const c: Client = {
    agent,
    csrf,
    get: (url) => agent.get(url),
    post: (url, b) => agent.post(url).set('X-CSRF-Token', c.csrf).send(b as object),
    put: (url, b) => agent.put(url).set('X-CSRF-Token', c.csrf).send(b as object),
    patch: (url, b) => agent.patch(url).set('X-CSRF-Token', c.csrf).send(b as object),
    delete: (url) => agent.delete(url).set('X-CSRF-Token', c.csrf),
  }
  return c
}

/** A cookie-keeping client of `app` (an Express app or a base URL) with its CSRF token, optionally signed in as `user`. */
export async function clientOf(app: Parameters<typeof request.agent>[0], user?: { email: string; password: string }): Promise<Client> {
  const agent = request.agent(app)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  const c = clientOver(agent, body.token)
  if (user) await c.post('/api/auth/login', { email: user.email, password: user.password }).expect(200)
  return c
}

/** A cookie-keeping client with its CSRF token, optionally signed in as `user`. */
export const client = (user?: { email: string; password: string }): Promise<Client> => clientOf(testApp(), user)

export async function signedIn(role: Role) {
  const user = await makeUser(role)
  return { user, c: await client(user) }
}
