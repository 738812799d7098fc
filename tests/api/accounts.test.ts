import { describe, expect, it } from 'vitest'
import { createHash } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import request from 'supertest'
import type { Socket } from 'socket.io-client'
import { db } from '../../server/db/sequelize'
import { passwordResetsSettled } from '../../server/services/passwords'
import { makeUser, uniqueEmail } from '../helpers/api'
import { connectSocket, emitAck, httpClient, useServer } from '../helpers/sockets'
import { openCase } from '../helpers/cases'
import { models, minutesAgo } from '../helpers/rows'

const running = useServer()

const signIn = (email: string, password: string) => httpClient(running.server.url, email, password)
async function signedOut() {
  const agent = request.agent(running.server.url)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  return { post: (u: string, b: object) => agent.post(u).set('X-CSRF-Token', body.token).send(b) }
}
const canSignIn = async (email: string, password: string) => (await (await signedOut()).post('/api/auth/login', { email, password })).status
const sql = <T extends object>(q: string, bind: unknown[]) => db().query<T>(q, { bind, type: QueryTypes.SELECT })
const sessionsOf = async (userId: string) => (await sql('SELECT 1 FROM "session" WHERE user_id = $1', [userId])).length
/** Resolves with the disconnect reason, or 'still connected' after `ms`. */
const disconnected = (s: Socket, ms = 5000) =>
  new Promise<string>((resolve) => {
    if (!s.connected) return resolve('already')
    const timer = setTimeout(() => resolve('still connected'), ms)
    s.once('disconnect', (reason) => { clearTimeout(timer); resolve(reason) })
  })
const outbox = (to: string, kind: string) => sql<{ text: string; created_at: Date }>('SELECT text, created_at FROM email_outbox WHERE lower(to_address) = lower($1) AND kind = $2 ORDER BY created_at', [to, kind])
const tokenIn = (text: string) => /\/reset-password#token=([A-Za-z0-9_-]{43})/.exec(text)?.[1]

describe('supervisors switch off any account, listeners included', () => {
  it("a listener's sessions and sockets end at once; they cannot sign in or connect until switched back on", async () => {
    const sup = await makeUser('supervisor', 'People Supervisor Aurelia')
    const l = await makeUser('listener', 'Switched-off Listener Bertil')
    const supC = await signIn(sup.email, sup.password)
    const phone = await signIn(l.email, l.password)
    const laptop = await signIn(l.email, l.password)
    const { case: open } = await openCase(phone, { title: 'Bass hump at 52 Hz' })
    const socket = await connectSocket(running.server.url, laptop.cookie)
    const gone = disconnected(socket)
    expect(await sessionsOf(l.id)).toBe(2)

    const found = (await supC.get(`/api/team/listeners?search=${encodeURIComponent('Bertil')}`).expect(200)).body
    expect(found.listeners).toEqual([expect.objectContaining({ id: l.id, role: 'listener', active: true, openCases: 1 })])

    const off = (await supC.post(`/api/team/members/${l.id}/deactivate`).expect(200)).body
    expect(off).toMatchObject({ id: l.id, role: 'listener', active: false })
    expect(await gone).toBe('io server disconnect')
    await phone.get('/api/auth/me').expect(401)
    await laptop.get('/api/cases').expect(401)
    expect(await sessionsOf(l.id)).toBe(0)
    expect(await canSignIn(l.email, l.password)).toBe(401)
    await expect(connectSocket(running.server.url, laptop.cookie)).rejects.toThrow(/signed_out/)
    // the case stays for the desk
    expect((await supC.get(`/api/cases/${open.id}`).expect(200)).body.status).toBe('submitted')
    // a listener is an account, not a team member: roles stay for the team
    await supC.put(`/api/team/members/${l.id}/role`, { role: 'advisor' }).expect(404)

    await supC.post(`/api/team/members/${l.id}/reactivate`).expect(200)
    expect(await canSignIn(l.email, l.password)).toBe(200)
    const audit = (await supC.get(`/api/audit?targetUserId=${l.id}`).expect(200)).body.entries
    expect(audit.map((e: { action: string }) => e.action)).toEqual(['member.reactivated', 'member.deactivated'])
    expect(audit[1].details).toEqual({ role: 'listener', sessionsEnded: 2 })
    socket.disconnect()
  })

  it('listeners and advisors cannot switch anyone off (403)', async () => {
    const l = await makeUser('listener')
    const other = await makeUser('listener')
    const a = await makeUser('advisor')
    for (const who of [l, a]) await (await signIn(who.email, who.password)).post(`/api/team/members/${other.id}/deactivate`).expect(403)
    expect(await canSignIn(other.email, other.password)).toBe(200)
  })
})

describe('POST /api/auth/password — change it while signed in', () => {
  it('needs the current password; afterwards the other sessions and their sockets end, this one stays', async () => {
    const u = await makeUser('advisor', 'Password Changer Cosima')
    const here = await signIn(u.email, u.password)
    const elsewhere = await signIn(u.email, u.password)
    const hereSocket = await connectSocket(running.server.url, here.cookie)
    const elsewhereSocket = await connectSocket(running.server.url, elsewhere.cookie)
    const hereGone = disconnected(hereSocket, 3000)
    const elsewhereGone = disconnected(elsewhereSocket, 20_000) // the wait spans four password requests (bcrypt), long on a loaded machine

    const wrong = await here.post('/api/auth/password', { currentPassword: 'not-my-password-77', newPassword: 'lantern-orchard-basalt-9' }).expect(400)
    expect(wrong.body.error).toMatchObject({ code: 'bad_current_password', fields: [{ path: 'currentPassword' }] })
    await elsewhere.get('/api/auth/me').expect(200)
    const same = await here.post('/api/auth/password', { currentPassword: u.password, newPassword: u.password }).expect(400)
    expect(same.body.error.fields[0].path).toBe('newPassword')
    const short = await here.post('/api/auth/password', { currentPassword: u.password, newPassword: 'eleven-char' }).expect(400)
    expect(short.body.error.fields[0].path).toBe('newPassword')

    const ok = await here.post('/api/auth/password', { currentPassword: u.password, newPassword: 'lantern-orchard-basalt-9' }).expect(200)
    expect(ok.body).toEqual({ sessionsEnded: 1 })
    expect(await elsewhereGone).toBe('io server disconnect')
    await elsewhere.get('/api/auth/me').expect(401)
    await here.get('/api/auth/me').expect(200)
    expect(await hereGone).toBe('still connected')
    expect((await emitAck(hereSocket, 'queue.join', {})).ok).toBe(true)
    expect(await sessionsOf(u.id)).toBe(1)

    expect(await canSignIn(u.email, u.password)).toBe(401)
    expect(await canSignIn(u.email, 'lantern-orchard-basalt-9')).toBe(200)
    const [row] = await sql<{ action: string; details: object }>("SELECT action, details FROM audit_log WHERE target_user_id = $1 AND action = 'password.changed'", [u.id])
    expect(row.details).toEqual({ sessionsEnded: 1 })
    const mails = await outbox(u.email, 'password-changed')
    expect(mails).toHaveLength(1)
    expect(mails[0].text).toContain('while signed in')
    hereSocket.disconnect()
  })

  it('signed out answers 401', async () => {
    const res = await (await signedOut()).post('/api/auth/password', { currentPassword: 'anything-at-all', newPassword: 'lantern-orchard-basalt-9' }).expect(401)
    expect(res.body.error.code).toBe('signed_out')
  })
})

describe('password reset by e-mail', () => {
  it('the same answer for a known and an unknown address; only the known one gets a link, stored hashed', async () => {
    const u = await makeUser('listener', 'Forgetful Listener Dagny')
    const nobody = uniqueEmail('nobody-here')
    const a = await (await signedOut()).post('/api/auth/password-reset/request', { email: u.email.toUpperCase() })
    const b = await (await signedOut()).post('/api/auth/password-reset/request', { email: nobody })
    expect(a.status).toBe(202)
    expect(b.status).toBe(a.status)
    expect(b.body).toEqual(a.body)
    expect(Object.keys(b.headers).sort()).toEqual(Object.keys(a.headers).sort())
    await passwordResetsSettled()
    expect(await outbox(nobody, 'password-reset')).toHaveLength(0)
    const [mail] = await outbox(u.email, 'password-reset')
    const token = tokenIn(mail.text)!
    expect(token).toBeDefined()
    const rows = await sql<{ token_hash: string }>('SELECT token_hash FROM password_reset_tokens WHERE user_id = $1', [u.id])
    expect(rows).toEqual([{ token_hash: createHash('sha256').update(token).digest('hex') }])
  })

  it('the link sets a new password once; every session and socket of the account ends; the link then answers 410', async () => {
    const u = await makeUser('advisor', 'Reset Advisor Eamon')
    const one = await signIn(u.email, u.password)
    const two = await signIn(u.email, u.password)
    const socket = await connectSocket(running.server.url, one.cookie)
    const gone = disconnected(socket)
    await (await signedOut()).post('/api/auth/password-reset/request', { email: u.email }).expect(202)
    await passwordResetsSettled()
    const token = tokenIn((await outbox(u.email, 'password-reset'))[0].text)!

    const short = await (await signedOut()).post('/api/auth/password-reset', { token, password: 'too-short' }).expect(400)
    expect(short.body.error.fields[0].path).toBe('password')
    await (await signedOut()).post('/api/auth/password-reset', { token, password: 'meadow-copper-anvil-31' }).expect(204)
    expect(await gone).toBe('io server disconnect')
    await one.get('/api/auth/me').expect(401)
    await two.get('/api/auth/me').expect(401)
    expect(await sessionsOf(u.id)).toBe(0)
    expect(await canSignIn(u.email, u.password)).toBe(401)
    expect(await canSignIn(u.email, 'meadow-copper-anvil-31')).toBe(200)

    const again = await (await signedOut()).post('/api/auth/password-reset', { token, password: 'another-new-password-5' }).expect(410)
    expect(again.body.error.code).toBe('link_gone')
    expect(await canSignIn(u.email, 'meadow-copper-anvil-31')).toBe(200)
    const [audit] = await sql<{ details: object }>("SELECT details FROM audit_log WHERE target_user_id = $1 AND action = 'password.reset'", [u.id])
    expect(audit.details).toEqual({ sessionsEnded: 2 })
    expect((await outbox(u.email, 'password-changed'))[0].text).toContain('with a link sent to this address')
  })

  it('an expired link, a link replaced by a newer one and a link never sent all answer 410 and change nothing', async () => {
    const u = await makeUser('listener', 'Reset Listener Fenna')
    for (let i = 0; i < 2; i++) {
      await (await signedOut()).post('/api/auth/password-reset/request', { email: u.email }).expect(202)
      await passwordResetsSettled()
    }
    const [first, second] = (await outbox(u.email, 'password-reset')).map((m) => tokenIn(m.text)!)
    await (await signedOut()).post('/api/auth/password-reset', { token: first, password: 'meadow-copper-anvil-31' }).expect(410)
    await models().PasswordResetToken.update({ expiresAt: minutesAgo(1 / 60) }, { where: { userId: u.id, spentAt: null } })
    await (await signedOut()).post('/api/auth/password-reset', { token: second, password: 'meadow-copper-anvil-31' }).expect(410)
    await (await signedOut()).post('/api/auth/password-reset', { token: 'x'.repeat(43), password: 'meadow-copper-anvil-31' }).expect(410)
    expect(await canSignIn(u.email, u.password)).toBe(200)
  })

  it('at most 3 links an hour per account, and none for a switched-off account; the answer never changes', async () => {
    const u = await makeUser('listener', 'Reset Listener Gwilym')
    const answers: number[] = []
    for (let i = 0; i < 5; i++) answers.push((await (await signedOut()).post('/api/auth/password-reset/request', { email: u.email })).status)
    await passwordResetsSettled()
    expect(answers).toEqual([202, 202, 202, 202, 202])
    expect(await outbox(u.email, 'password-reset')).toHaveLength(3)

    const off = await makeUser('listener', 'Reset Listener Halla')
    const sup = await makeUser('supervisor')
    await (await signIn(sup.email, sup.password)).post(`/api/team/members/${off.id}/deactivate`).expect(200)
    await (await signedOut()).post('/api/auth/password-reset/request', { email: off.email }).expect(202)
    await passwordResetsSettled()
    expect(await outbox(off.email, 'password-reset')).toHaveLength(0)
  })
})
