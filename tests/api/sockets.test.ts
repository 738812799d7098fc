import { afterAll, describe, expect, it } from 'vitest'
import type { ChildProcess } from 'node:child_process'
import { makeUser } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { connectSocket, emitAck, httpClient, joinedSockets, nextEvent, sessionFor, startOtherProcess, useServer } from '../helpers/sockets'

const running = useServer()

const signIn = (email: string, password: string) => httpClient(running.server.url, email, password)

async function people() {
  const l = await makeUser('listener', 'Socket Listener')
  const a = await makeUser('advisor', 'Socket Advisor')
  const listener = await signIn(l.email, l.password)
  const advisor = await signIn(a.email, a.password)
  const { case: c } = await openCase(listener)
  return { listener, advisor, caseId: c.id, l, a }
}

describe('socket sign-in and joining case rooms', () => {
  it('a socket without a session is refused', async () => {
    await expect(connectSocket(running.server.url)).rejects.toThrow(/signed_out/)
  })
  it('a stranger cannot join a case room (checked on the server), the listener and an advisor can', async () => {
    const { listener, advisor, caseId } = await people()
    const s = await makeUser('listener', 'Socket Stranger')
    const stranger = await signIn(s.email, s.password)
    const ss = await connectSocket(running.server.url, stranger.cookie)
    expect(await emitAck(ss, 'case.join', { caseId })).toMatchObject({ ok: false, error: { code: 'not_found' } })
    const ls = await connectSocket(running.server.url, listener.cookie)
    expect(await emitAck(ls, 'case.join', { caseId })).toMatchObject({ ok: true })
    const as = await connectSocket(running.server.url, advisor.cookie)
    expect(await emitAck(as, 'case.join', { caseId })).toMatchObject({ ok: true })
    for (const x of [ss, ls, as]) x.disconnect()
  })
})

describe('live events', () => {
  it("an advisor's reply reaches the listener's socket; an internal note reaches only the team", async () => {
    const { listener, advisor, caseId } = await people()
    const [ls, as] = await joinedSockets(running.server.url, caseId, listener.cookie, advisor.cookie)
    const listenerSawInternal: unknown[] = []
    ls.on('case.message', (m: { internal: boolean }) => { if (m.internal) listenerSawInternal.push(m) })
    const teamNote = nextEvent<{ internal: boolean }>(as, 'case.message', (m) => m.internal)
    await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Internal: check the 57 Hz width mode', internal: true }).expect(201)
    await teamNote
    const reply = nextEvent<{ caseId: string; messageId: string; internal: boolean }>(ls, 'case.message', (m) => !m.internal)
    const posted = (await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Thanks, reading your room now' }).expect(201)).body
    expect(await reply).toMatchObject({ caseId, messageId: posted.id, internal: false })
    expect(listenerSawInternal).toEqual([])
    ls.disconnect()
    as.disconnect()
  })
  it('presence: the advisor sees the listener typing', async () => {
    const { listener, advisor, caseId } = await people()
    const [ls, as] = await joinedSockets(running.server.url, caseId, listener.cookie, advisor.cookie)
    const typing = nextEvent<{ state: string; name: string }>(as, 'presence', (p) => p.state === 'typing')
    ls.emit('case.typing', { caseId, typing: true })
    expect(await typing).toMatchObject({ state: 'typing', name: 'Socket Listener' })
    ls.disconnect()
    as.disconnect()
  })
  it('the queue room hears about changes; a listener socket is not in it', async () => {
    const { listener, advisor, caseId } = await people()
    const as = await connectSocket(running.server.url, advisor.cookie)
    const ls = await connectSocket(running.server.url, listener.cookie)
    let listenerHeard = 0
    ls.on('queue.changed', () => listenerHeard++)
    const changed = nextEvent<{ caseId: string }>(as, 'queue.changed', (p) => p.caseId === caseId)
    await advisor.patch(`/api/cases/${caseId}`, { assigneeId: (await advisor.get('/api/auth/me')).body.id }).expect(200)
    await changed
    expect(listenerHeard).toBe(0)
    as.disconnect()
    ls.disconnect()
  })
  it('a reconnecting socket catches up on what it missed, from the database', async () => {
    const { listener, advisor, caseId } = await people()
    const ls = await connectSocket(running.server.url, listener.cookie)
    const first = await emitAck(ls, 'case.join', { caseId, afterSeq: 0 })
    const lastSeq = Math.max(...first.missed!.map((e) => e.seq))
    ls.disconnect()
    await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Sent while you were away' }).expect(201)
    await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Internal while away', internal: true }).expect(201)
    const again = await connectSocket(running.server.url, listener.cookie)
    const caught = await emitAck(again, 'case.join', { caseId, afterSeq: lastSeq })
    expect(caught.ok).toBe(true)
    const kinds = caught.missed!.map((e) => e.kind)
    expect(kinds).toContain('message')
    expect(kinds).not.toContain('note')
    again.disconnect()
  })
})

describe('across two server processes (PostgreSQL adapter)', () => {
  let other: ChildProcess | undefined
  afterAll(() => {
    other?.kill('SIGTERM')
  })
  it('a message posted on one process reaches a socket connected to the other', async () => {
    const o = await startOtherProcess()
    other = o.child
    const otherUrl = o.url
    const { listener, advisor, caseId, l } = await people()
    const remote = await sessionFor(otherUrl, l.email, l.password)
    const rs = await connectSocket(otherUrl, remote.cookie)
    expect(await emitAck(rs, 'case.join', { caseId })).toMatchObject({ ok: true })
    // give the adapter's LISTEN a moment to be in place on both nodes
    await new Promise((r) => setTimeout(r, 500))
    const arrived = nextEvent<{ messageId: string }>(rs, 'case.message', () => true, 15_000)
    const posted = (await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Hello from node one' }).expect(201)).body
    expect((await arrived).messageId).toBe(posted.id)
    rs.disconnect()
    void listener
  }, 90_000)
})
