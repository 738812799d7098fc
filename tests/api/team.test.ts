import { afterAll, afterEach, describe, expect, it, vi } from 'vitest'
import { QueryTypes } from 'sequelize'
import { client, closeTestApp, signedIn, uniqueEmail, makeUser } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { db } from '../../server/db/sequelize'
import { models, minutesAgo } from '../helpers/rows'

afterAll(closeTestApp)

const NEW_PASSWORD = 'plum-lantern-orbit-42'

/** The set-password link from the invitation e-mail in the outbox. */
async function invitationLink(email: string): Promise<string> {
  const rows = await db().query<{ text: string }>(`SELECT text FROM email_outbox WHERE to_address = $1 AND kind = 'invitation' ORDER BY created_at DESC LIMIT 1`, {
    bind: [email], type: QueryTypes.SELECT,
  })
  const m = /\/welcome\/([A-Za-z0-9_-]{43})/.exec(rows[0]?.text ?? '')
  if (!m) throw new Error(`no invitation link in the e-mail to ${email}`)
  return m[1]
}

describe('invitations', () => {
  it('invite → the e-mail link → set a password → signed in as the new advisor; the link then answers 410', async () => {
    const sup = await signedIn('supervisor')
    const email = uniqueEmail('invitee')
    const inv = (await sup.c.post('/api/team/invitations', { email, name: 'Odile Fenwick', role: 'advisor' }).expect(201)).body
    expect(inv).toMatchObject({ email, name: 'Odile Fenwick', role: 'advisor', state: 'pending', invitedBy: { id: sup.user.id } })
    expect(Date.parse(inv.expiresAt) - Date.parse(inv.createdAt)).toBeCloseTo(72 * 3_600_000, -4)

    const token = await invitationLink(email)
    const stored = await db().query<{ token_hash: string }>('SELECT token_hash FROM team_invitations WHERE id = $1', { bind: [inv.id], type: QueryTypes.SELECT })
    expect(stored[0].token_hash).not.toContain(token)
    expect(stored[0].token_hash).toMatch(/^[0-9a-f]{64}$/)

    const visitor = await client()
    expect((await visitor.get(`/api/team/invitations/by-token/${token}`).expect(200)).body).toMatchObject({ email, name: 'Odile Fenwick', role: 'advisor' })
    const user = (await visitor.post('/api/team/invitations/accept', { token, password: NEW_PASSWORD }).expect(201)).body
    expect(user).toMatchObject({ email, name: 'Odile Fenwick', role: 'advisor' })
    expect((await visitor.get('/api/auth/me').expect(200)).body.id).toBe(user.id)
    await visitor.get('/api/cases').expect(200)

    const again = await (await client()).post('/api/team/invitations/accept', { token, password: NEW_PASSWORD }).expect(410)
    expect(again.body.error.message).toMatch(/already been used/)
    await (await client()).get(`/api/team/invitations/by-token/${token}`).expect(410)
    await client({ email, password: NEW_PASSWORD })

    const audit = (await sup.c.get(`/api/audit?targetUserId=${user.id}`).expect(200)).body
    expect(audit.entries.map((e: { action: string }) => e.action)).toEqual(['invitation.accepted'])
    const sent = (await sup.c.get(`/api/audit?actorId=${sup.user.id}&action=invitation.sent`).expect(200)).body
    expect(sent.entries[0]).toMatchObject({ action: 'invitation.sent', target: { email, name: 'Odile Fenwick' }, details: { role: 'advisor' } })
  })

  it('an expired link answers 410 and creates no account', async () => {
    const sup = await signedIn('supervisor')
    const email = uniqueEmail('late')
    const inv = (await sup.c.post('/api/team/invitations', { email, name: 'Late Larkspur', role: 'supervisor' }).expect(201)).body
    const token = await invitationLink(email)
    await models().TeamInvitation.update({ expiresAt: minutesAgo(1) }, { where: { id: inv.id } })
    const res = await (await client()).post('/api/team/invitations/accept', { token, password: NEW_PASSWORD }).expect(410)
    expect(res.body.error).toMatchObject({ code: 'link_gone', message: expect.stringMatching(/expired/) })
    const users = await db().query('SELECT 1 FROM users WHERE email = $1', { bind: [email], type: QueryTypes.SELECT })
    expect(users).toHaveLength(0)
  })

  describe("by the database's clock, not this node's", () => {
    const HOUR = 3_600_000
    /** This process's clock (Date only; timers keep running) moved by `ms`, as on a node whose clock is off. */
    const skewNodeClock = (ms: number) => vi.useFakeTimers({ toFake: ['Date'], now: Date.now() + ms })
    afterEach(() => vi.useRealTimers())

    it('a link the database says has expired answers 410, although the node clock, two hours slow, says it has an hour and more left', async () => {
      const sup = await signedIn('supervisor')
      const email = uniqueEmail('skewed')
      const inv = (await sup.c.post('/api/team/invitations', { email, name: 'Wilhelmina Quarrie', role: 'advisor' }).expect(201)).body
      const token = await invitationLink(email)
      await db().query(`UPDATE team_invitations SET expires_at = now() - interval '1 minute' WHERE id = $1`, { bind: [inv.id] })
      const visitor = await client()
      skewNodeClock(-2 * HOUR)
      await visitor.get(`/api/team/invitations/by-token/${token}`).expect(410)
      const res = await visitor.post('/api/team/invitations/accept', { token, password: NEW_PASSWORD }).expect(410)
      expect(res.body.error).toMatchObject({ code: 'link_gone', message: expect.stringMatching(/expired/) })
      const listed = (await sup.c.get('/api/team/invitations').expect(200)).body.invitations as { id: string; state: string }[]
      expect(listed.find((i) => i.id === inv.id)?.state).toBe('expired')
      vi.useRealTimers()
      const users = await db().query('SELECT 1 FROM users WHERE email = $1', { bind: [email], type: QueryTypes.SELECT })
      expect(users).toHaveLength(0)
    })

    it("a new link's 72 hours start at the database's now, even on a node whose clock is two hours fast", async () => {
      const sup = await signedIn('supervisor')
      const email = uniqueEmail('fast-node')
      skewNodeClock(2 * HOUR)
      const inv = (await sup.c.post('/api/team/invitations', { email, name: 'Caspian Thorold', role: 'advisor' }).expect(201)).body
      vi.useRealTimers()
      const [row] = await db().query<{ hours: number }>(`SELECT extract(epoch FROM expires_at - now()) / 3600 AS hours FROM team_invitations WHERE id = $1`, { bind: [inv.id], type: QueryTypes.SELECT })
      expect(Number(row.hours)).toBeGreaterThan(71.5)
      expect(Number(row.hours)).toBeLessThanOrEqual(72)
      expect(inv.state).toBe('pending')
      // the link works from a node whose clock is right
      const token = await invitationLink(email)
      await (await client()).get(`/api/team/invitations/by-token/${token}`).expect(200)
    })
  })

  it('inviting the same address again withdraws the first link; a withdrawn link answers 410', async () => {
    const sup = await signedIn('supervisor')
    const email = uniqueEmail('twice')
    await sup.c.post('/api/team/invitations', { email, name: 'Twice Tamsin', role: 'advisor' }).expect(201)
    const first = await invitationLink(email)
    const second = (await sup.c.post('/api/team/invitations', { email, name: 'Twice Tamsin', role: 'advisor' }).expect(201)).body
    expect((await (await client()).get(`/api/team/invitations/by-token/${first}`).expect(410)).body.error.message).toMatch(/withdrawn/)
    await sup.c.delete(`/api/team/invitations/${second.id}`).expect(204)
    await sup.c.delete(`/api/team/invitations/${second.id}`).expect(404)
    const listed = (await sup.c.get('/api/team/invitations').expect(200)).body.invitations
    expect(listed.find((i: { email: string }) => i.email === email)).toBeUndefined()
  })

  it('an unknown link answers 404; a malformed one 400; an address that has an account 409', async () => {
    const sup = await signedIn('supervisor')
    await (await client()).get(`/api/team/invitations/by-token/${'A'.repeat(43)}`).expect(404)
    await (await client()).get('/api/team/invitations/by-token/short').expect(400)
    const res = await sup.c.post('/api/team/invitations', { email: sup.user.email, name: 'Me Again', role: 'advisor' }).expect(409)
    expect(res.body.error.code).toBe('email_taken')
    const bad = await sup.c.post('/api/team/invitations', { email: 'not-an-address', name: '', role: 'listener' }).expect(400)
    expect(bad.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['email', 'name', 'role'])
  })

  it('a password that is too short answers 400 and leaves the link usable', async () => {
    const sup = await signedIn('supervisor')
    const email = uniqueEmail('short')
    await sup.c.post('/api/team/invitations', { email, name: 'Short Sorrel', role: 'advisor' }).expect(201)
    const token = await invitationLink(email)
    const res = await (await client()).post('/api/team/invitations/accept', { token, password: 'short' }).expect(400)
    expect(res.body.error.fields[0].path).toBe('password')
    await (await client()).get(`/api/team/invitations/by-token/${token}`).expect(200)
  })
})

describe('switching accounts off and on, and roles', () => {
  it("deactivating ends the advisor's session at once and returns their open cases to the queue", async () => {
    const sup = await signedIn('supervisor')
    const advisor = await signedIn('advisor')
    const listener = await signedIn('listener')
    const { case: open } = await openCase(listener.c, { title: 'Flutter echo between bare walls' })
    await advisor.c.patch(`/api/cases/${open.id}`, { status: 'in_review', fromStatus: 'submitted' }).expect(200)
    const { case: done } = await openCase(listener.c, { title: 'Already finished case' })
    await advisor.c.patch(`/api/cases/${done.id}`, { status: 'in_review', fromStatus: 'submitted' }).expect(200)
    await advisor.c.patch(`/api/cases/${done.id}`, { status: 'closed', fromStatus: 'in_review' }).expect(200)
    await advisor.c.get('/api/auth/me').expect(200)

    const m = (await sup.c.post(`/api/team/members/${advisor.user.id}/deactivate`).expect(200)).body
    expect(m).toMatchObject({ id: advisor.user.id, active: false, openCases: 0 })

    await advisor.c.get('/api/auth/me').expect(401)
    await advisor.c.get('/api/cases').expect(401)
    const sessions = await db().query('SELECT 1 FROM "session" WHERE user_id = $1', { bind: [advisor.user.id], type: QueryTypes.SELECT })
    expect(sessions).toHaveLength(0)
    await (await client()).post('/api/auth/login', { email: advisor.user.email, password: advisor.user.password }).expect(401)

    const back = (await sup.c.get(`/api/cases/${open.id}`).expect(200)).body
    expect(back.assignee).toBeNull()
    expect(back.status).toBe('in_review')
    expect((await sup.c.get(`/api/cases/${done.id}`).expect(200)).body.assignee.id).toBe(advisor.user.id)
    const events = (await sup.c.get(`/api/cases/${open.id}/events`).expect(200)).body.events
    expect(events.at(-1)).toMatchObject({ kind: 'unassigned', actor: { id: sup.user.id }, data: { fromAssigneeId: advisor.user.id, reason: 'account switched off' } })
    const forListener = (await listener.c.get(`/api/cases/${open.id}/events`).expect(200)).body.events
    expect(forListener.some((e: { kind: string }) => e.kind === 'unassigned')).toBe(false)

    await sup.c.post(`/api/team/members/${advisor.user.id}/deactivate`).expect(409)
    await sup.c.post(`/api/team/members/${advisor.user.id}/reactivate`).expect(200)
    await client({ email: advisor.user.email, password: advisor.user.password })
    const audit = (await sup.c.get(`/api/audit?targetUserId=${advisor.user.id}`).expect(200)).body
    expect(audit.entries.map((e: { action: string }) => e.action)).toEqual(['member.reactivated', 'member.deactivated'])
    expect(audit.entries[1].details).toEqual({ casesReturned: 1 })
  })

  it('a supervisor can neither switch off nor change the role of their own account (403)', async () => {
    const sup = await signedIn('supervisor')
    expect((await sup.c.post(`/api/team/members/${sup.user.id}/deactivate`).expect(403)).body.error.message).toMatch(/own account/)
    await sup.c.put(`/api/team/members/${sup.user.id}/role`, { role: 'advisor' }).expect(403)
    await sup.c.get('/api/auth/me').expect(200)
  })

  it('a role change applies from the next request; a listener has no team role to change (404)', async () => {
    const sup = await signedIn('supervisor')
    const advisor = await signedIn('advisor')
    await advisor.c.get('/api/metrics/status').expect(403)
    expect((await sup.c.put(`/api/team/members/${advisor.user.id}/role`, { role: 'supervisor' }).expect(200)).body.role).toBe('supervisor')
    await advisor.c.get('/api/metrics/status').expect(200)
    await sup.c.put(`/api/team/members/${advisor.user.id}/role`, { role: 'supervisor' }).expect(409)
    await sup.c.put(`/api/team/members/${advisor.user.id}/role`, { role: 'listener' }).expect(400)
    const listener = await makeUser('listener')
    await sup.c.put(`/api/team/members/${listener.id}/role`, { role: 'advisor' }).expect(404)
    const audit = (await sup.c.get(`/api/audit?actorId=${sup.user.id}&action=member.role_changed`).expect(200)).body
    expect(audit.entries[0].details).toEqual({ from: 'advisor', to: 'supervisor' })
  })

  it('GET /api/team/members lists advisors and supervisors with their open cases', async () => {
    const sup = await signedIn('supervisor')
    const advisor = await makeUser('advisor', 'Listed Advisor Wren')
    const members = (await sup.c.get('/api/team/members').expect(200)).body.members
    expect(members.find((m: { id: string }) => m.id === advisor.id)).toMatchObject({ name: 'Listed Advisor Wren', role: 'advisor', active: true, openCases: 0 })
    expect(members.every((m: { role: string }) => m.role !== 'listener')).toBe(true)
  })
})

describe('GET /api/audit', () => {
  it('filters by date: a window before the entries is empty', async () => {
    const sup = await signedIn('supervisor')
    const q = new URLSearchParams({ actorId: sup.user.id, from: '2020-01-01T00:00:00Z', to: '2020-02-01T00:00:00Z' })
    await sup.c.post('/api/team/invitations', { email: uniqueEmail('dated'), name: 'Dated Dahlia', role: 'advisor' }).expect(201)
    expect((await sup.c.get(`/api/audit?${q}`).expect(200)).body).toEqual({ entries: [], total: 0 })
    q.set('to', new Date(Date.now() + 60_000).toISOString())
    expect((await sup.c.get(`/api/audit?${q}`).expect(200)).body.total).toBe(1)
    await sup.c.get('/api/audit?action=made.up').expect(400)
  })
})

describe('role guards on every team route', () => {
  const id = '00000000-0000-4000-8000-000000000000'
  const routes: [string, string, object?][] = [
    ['get', '/api/team/members'],
    ['post', `/api/team/members/${id}/deactivate`],
    ['post', `/api/team/members/${id}/reactivate`],
    ['put', `/api/team/members/${id}/role`, { role: 'advisor' }],
    ['get', '/api/team/invitations'],
    ['post', '/api/team/invitations', { email: 'x@example.test', name: 'X', role: 'advisor' }],
    ['delete', `/api/team/invitations/${id}`],
    ['get', '/api/audit'],
  ]
  it.each(routes)('%s %s: signed out 401, listener and advisor 403', async (method, url, body) => {
    const call = (c: Awaited<ReturnType<typeof client>>) => (method === 'get' ? c.get(url) : method === 'delete' ? c.delete(url) : (c[method as 'post' | 'put'])(url, body))
    await call(await client()).expect(401)
    await call((await signedIn('listener')).c).expect(403)
    await call((await signedIn('advisor')).c).expect(403)
  })
})

describe('POST /api/cases/:id/rating', () => {
  async function closedCase() {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const { case: c } = await openCase(listener.c, { title: 'Ratable slap echo' })
    await advisor.c.patch(`/api/cases/${c.id}`, { status: 'in_review', fromStatus: 'submitted' }).expect(200)
    return { listener, advisor, id: c.id }
  }
  it('the listener rates a closed case once (201, then 409); staff and strangers cannot', async () => {
    const { listener, advisor, id } = await closedCase()
    await listener.c.post(`/api/cases/${id}/rating`, { score: 4, comment: 'Helpful' }).expect(409)
    await advisor.c.patch(`/api/cases/${id}`, { status: 'closed', fromStatus: 'in_review' }).expect(200)
    await listener.c.post(`/api/cases/${id}/rating`, { score: 6 }).expect(400)
    const r = (await listener.c.post(`/api/cases/${id}/rating`, { score: 4, comment: 'Helpful, the corner traps worked' }).expect(201)).body
    expect(r).toMatchObject({ caseId: id, score: 4, comment: 'Helpful, the corner traps worked' })
    expect((await listener.c.post(`/api/cases/${id}/rating`, { score: 1 }).expect(409)).body.error.code).toBe('already_rated')
    await advisor.c.post(`/api/cases/${id}/rating`, { score: 5 }).expect(403)
    await (await signedIn('listener')).c.post(`/api/cases/${id}/rating`, { score: 5 }).expect(404)
    await (await client()).post(`/api/cases/${id}/rating`, { score: 5 }).expect(401)
    expect((await advisor.c.get(`/api/cases/${id}/rating`).expect(200)).body.rating.score).toBe(4)
    const events = (await listener.c.get(`/api/cases/${id}/events`).expect(200)).body.events
    expect(events.at(-1)).toMatchObject({ kind: 'rated', data: { score: 4 } })
  })
})
