/**
 * The in-process cache of the session and signed-in user (server/auth/session-store.ts) across two
 * server processes on one database: node B answers a signed-in session from its memory, yet a change
 * made through node A (deactivation, sign-out, role change, password change) refuses or corrects B's
 * very next request, through the triggers of migration 0061 and each node's LISTEN (server/db/change-feed.ts).
 * Node B runs with a long cache bound (SESSION_CACHE_SECONDS=600), so only the invalidation can make it forget.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ChildProcess } from 'node:child_process'
import request from 'supertest'
import { startServer, type RunningServer } from '../../server/server'
import { makeUser } from '../helpers/api'
import { sessionFor, startOtherProcess } from '../helpers/sockets'
import { db } from '../../server/db/sequelize'

let a: RunningServer
let other: ChildProcess | undefined
let bUrl = ''

beforeAll(async () => {
  a = await startServer({ port: 0, clientDir: false, background: false })
  const b = await startOtherProcess({ SESSION_CACHE_SECONDS: '600' })
  other = b.child
  bUrl = b.url
}, 90_000)

afterAll(async () => {
  other?.kill('SIGTERM')
  await a?.close()
})

const me = (url: string, cookie: string) => request(url).get('/api/auth/me').set('Cookie', cookie)

/** A changed row that announces nothing (its trigger switched off for one transaction): what B shows then comes from its memory. */
async function silently(sql: string, bind: unknown[]) {
  await db().transaction(async (t) => {
    await db().query('SET LOCAL session_replication_role = replica', { transaction: t })
    await db().query(sql, { bind, transaction: t })
  })
}

async function supervisorOnA() {
  const s = await makeUser('supervisor', 'Cache Supervisor')
  return sessionFor(a.url, s.email, s.password)
}

describe('session cache across two nodes', () => {
  it('node B answers from memory (a change that announces nothing is not seen), and a deactivation through node A refuses B at once', async () => {
    const l = await makeUser('listener', 'Cache Listener')
    const onB = await sessionFor(bUrl, l.email, l.password)
    expect((await me(bUrl, onB.cookie).expect(200)).body).toMatchObject({ id: l.id, name: 'Cache Listener' })
    // proves B's cache is on: a rename with the trigger switched off does not reach B's answer
    await silently('UPDATE users SET name = $2 WHERE id = $1', [l.id, 'Renamed Quietly'])
    expect((await me(bUrl, onB.cookie).expect(200)).body.name).toBe('Cache Listener')
    // the same account renamed with triggers on: B's next answer has the new name
    await db().query('UPDATE users SET name = $2 WHERE id = $1', { bind: [l.id, 'Renamed Aloud'] })
    expect((await me(bUrl, onB.cookie).expect(200)).body.name).toBe('Renamed Aloud')

    const sup = await supervisorOnA()
    await sup.agent.post(`/api/team/members/${l.id}/deactivate`).set('X-CSRF-Token', sup.csrf).expect(200)
    await me(bUrl, onB.cookie).expect(401)
  })

  it('signing out through node A ends the session on node B at once', async () => {
    const l = await makeUser('listener', 'Cache Sign-out')
    const onB = await sessionFor(bUrl, l.email, l.password)
    await me(bUrl, onB.cookie).expect(200)
    await me(bUrl, onB.cookie).expect(200)
    // the same session (the cookie) used on node A to sign out
    const csrf = (await request(a.url).get('/api/auth/csrf').set('Cookie', onB.cookie).expect(200)).body.token
    await request(a.url).post('/api/auth/logout').set('Cookie', onB.cookie).set('X-CSRF-Token', csrf).expect(204)
    await me(bUrl, onB.cookie).expect(401)
  })

  it('a role change through node A shows on node B at once', async () => {
    const adv = await makeUser('advisor', 'Cache Advisor')
    const onB = await sessionFor(bUrl, adv.email, adv.password)
    expect((await me(bUrl, onB.cookie).expect(200)).body.role).toBe('advisor')
    const sup = await supervisorOnA()
    await sup.agent.put(`/api/team/members/${adv.id}/role`).set('X-CSRF-Token', sup.csrf).send({ role: 'supervisor' }).expect(200)
    expect((await me(bUrl, onB.cookie).expect(200)).body.role).toBe('supervisor')
  })

  it('a password change on node A ends the account\'s other sessions on node B at once', async () => {
    const l = await makeUser('listener', 'Cache Password')
    const onB = await sessionFor(bUrl, l.email, l.password)
    await me(bUrl, onB.cookie).expect(200)
    const onA = await sessionFor(a.url, l.email, l.password)
    await onA.agent.post('/api/auth/password').set('X-CSRF-Token', onA.csrf)
      .send({ currentPassword: l.password, newPassword: 'a-new-and-long-passphrase-for-cache-tests' }).expect(200)
    await me(bUrl, onB.cookie).expect(401)
    await onA.agent.get('/api/auth/me').expect(200)
  })
})
